// What the UI offers per role. The server refuses anyway; this only hides.
export type Role = 'viewer' | 'electrician' | 'programmer' | 'owner';

export const canEditPatch = (role: string) => role === 'programmer' || role === 'owner';
export const canSetState = (role: string) => role !== 'viewer';
