import { SpotCheckScreen } from '../../components/screens/SpotCheckScreen';

export default SpotCheckScreen;
