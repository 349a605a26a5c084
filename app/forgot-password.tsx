import { ForgotPasswordScreen } from '../components/screens/ForgotPasswordScreen';

export default ForgotPasswordScreen;
