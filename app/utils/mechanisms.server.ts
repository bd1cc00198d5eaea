// Mechanism, membership, invitation, view-link and snapshot queries for route modules. Routes reach
// server/ only through *.server.ts modules, so the bundler refuses by name to ship any of this to the browser.
export { findSnapshot, listSnapshots, type SnapshotKind } from "../../server/collab/snapshots";
export { acceptInvitation, findPendingInvitation, lookUpInvitation, pendingInvitations, revokeInvitation, waitingSeats } from "../../server/db/invitations";
export {
  addMember,
  changeRole,
  createMechanism,
  deleteMechanism,
  findMechanism,
  isMembershipError,
  listMechanismsFor,
  listMembers,
  removeMember,
  renameMechanism,
  roleHistory,
  transferOwnership,
} from "../../server/db/mechanisms";
export { listViewLinks, revokeViewLink } from "../../server/db/view-links";
