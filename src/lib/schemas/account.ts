import { z } from 'zod';

// Account forms (client-safe). Password strength beyond the length is checked on the server
// (src/lib/server/auth/policy.ts) against a bundled list of common passwords.

const email = z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254);
const newPassword = z.string().min(10, 'Use at least 10 characters.').max(200, 'Use at most 200 characters.');

export const signUp = z.object({
	name: z.string().trim().min(1, 'Tell us your name.').max(120),
	email,
	password: newPassword
});

export const emailOnly = z.object({ email });

export const newPasswordForm = z.object({ password: newPassword });

export const changePassword = z.object({
	current: z.string().min(1, 'Enter your current password.').max(1000),
	password: newPassword
});

export const renameForm = z.object({ name: z.string().trim().min(1, 'Tell us your name.').max(120) });
