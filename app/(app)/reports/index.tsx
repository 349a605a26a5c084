import { ReportsScreen } from '../../../components/screens/ReportsScreen';

export default ReportsScreen;
