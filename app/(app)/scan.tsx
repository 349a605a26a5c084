import { ScanScreen } from '../../components/screens/ScanScreen';

export default ScanScreen;
