/** What app/ uses of the server for crew, mail and audit; re-exported by server/facade.ts. */
export { listCrew, inviteMember, changeMember, sendMemberLink } from "../crew/members";
export { linkState, acceptLink, requestReset } from "../crew/links";
export { myProfile, updateMe } from "../crew/me";
export { listCaughtMail, MailListQuery } from "../mail/caught";
export { listAudit, auditActions, AuditQuery } from "../audit/audit";
export { userIdParam } from "../crew/params";
