import { DevicesScreen } from '../../../components/screens/DevicesScreen';

export default DevicesScreen;
