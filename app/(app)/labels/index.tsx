import { LabelsScreen } from '../../../components/screens/LabelsScreen';

export default LabelsScreen;
