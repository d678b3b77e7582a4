/**
 * Said below a new-password field (not in its label, which names the field only), matching the
 * password policy of lib/auth/password-policy.ts.
 */
export const PASSWORD_ADVICE =
  "A few unrelated words work well. Refused: common passwords, runs such as 1234567890 or aaaaaaaaaa, and your own email address or name.";
