import { AuditLogScreen } from '../../../components/screens/AuditLogScreen';

export default AuditLogScreen;
