// Account queries for route modules. Routes reach server/ only through *.server.ts modules, so the
// bundler refuses by name to ship any of this to the browser.
export { createUser, isAuthFailure, signInForm, signUpForm } from "../../server/auth/authenticator";
export { lookUpEmailToken, resetPassword, sentRecently, verifyAddress } from "../../server/auth/email-tokens";
export { createApiToken, listApiTokens, revokeApiToken } from "../../server/db/api-tokens";
