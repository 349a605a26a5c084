import { SignInScreen } from '../components/screens/SignInScreen';

export default SignInScreen;
