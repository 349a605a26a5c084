import { SettingsScreen } from '../../../components/screens/SettingsScreen';

export default SettingsScreen;
