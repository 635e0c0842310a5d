/** Sign-in messages shown to people; shared by the server and the form. */
export const SIGN_IN_MESSAGES = {
  invalid: 'The e-mail address or password is not right.',
  disabled: 'This account is disabled. Ask an administrator to enable it.',
  unavailable: 'Sign-in is unavailable right now. Try again in a moment.',
  rateLimited: (minutes: number) =>
    `Too many failed sign-ins. Sign-in is paused for this account or network; try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
} as const;

/** next-auth's error code for a credentials provider that returned null. */
export const NEXTAUTH_CREDENTIALS_ERROR = 'CredentialsSignin';
