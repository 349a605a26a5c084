import { AttentionScreen } from '../../../components/screens/AttentionScreen';

export default AttentionScreen;
