import { RemindersScreen } from '../../../components/screens/RemindersScreen';

export default RemindersScreen;
