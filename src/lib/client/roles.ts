// What the UI offers per role. The server refuses anyway; this only hides.
export type { Role } from '../vocab';

export const canEditPatch = (role: string) => role === 'programmer' || role === 'owner';
export const canSetState = (role: string) => role !== 'viewer';
