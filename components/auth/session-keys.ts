/** Where the browser keeps the session (localStorage on the web). Read before the app runs, by app/+html.tsx, too. */
export const TOKEN_KEY = 'warmfold.token';
export const USER_KEY = 'warmfold.user';
