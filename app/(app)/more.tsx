import { MoreScreen } from '../../components/screens/MoreScreen';

export default MoreScreen;
