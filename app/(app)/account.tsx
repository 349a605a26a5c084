import { AccountScreen } from '../../components/screens/AccountScreen';

export default AccountScreen;
