import { SitesScreen } from '../../../components/screens/SitesScreen';

export default SitesScreen;
