export { auditQueries } from './api/audit-queries';
export { AuditScreen } from './components/audit-screen';
