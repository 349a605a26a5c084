import { TeamScreen } from '../../../components/screens/TeamScreen';

export default TeamScreen;
