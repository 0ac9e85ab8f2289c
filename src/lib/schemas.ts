/** Form schemas shared by the server actions and the client-side form. */
import { z } from 'zod';

export const signInSchema = z.object({
	email: z.string().trim().min(1, 'Give your e-mail address.').max(200, 'That address is too long.').pipe(z.email('Give a valid e-mail address.')),
	password: z.string().min(1, 'Give your password.').max(200, 'That password is too long.')
});
