import { OutboxScreen } from '../../../components/screens/OutboxScreen';

export default OutboxScreen;
