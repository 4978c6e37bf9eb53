import * as v from "valibot";

// Length limits: OWASP ASVS 4.0.3 V2.1.1 (at least 12) and V2.1.2 (at most 128); no composition
// rules (V2.1.9); checked against common passwords (V2.1.7).
export const PASSWORD_MIN = 12;
export const PASSWORD_MAX = 128;

// A short list of passwords of 12+ characters that appear near the top of published breach
// frequency lists (from memory; a small stand-in for the full lists ASVS V2.1.7 means).
const COMMON = new Set([
  "123456789012", "1234567890123", "12345678901234", "123123123123", "111111111111", "000000000000",
  "password1234", "password12345", "password123!", "passw0rd1234", "qwertyuiop12", "qwertyuiopas",
  "qwerty123456", "1q2w3e4r5t6y", "1qaz2wsx3edc", "zaq12wsxcde3", "abcdefghijkl", "abc123456789",
  "iloveyou1234", "welcome12345", "letmein12345", "administrator", "changeme1234", "trustno1trustno1",
  "football1234", "baseball1234", "sunshine1234", "princess1234", "monkey123456", "dragon123456",
  "qwertyqwerty", "asdfghjkl123", "aaaaaaaaaaaa", "passwordpassword", "mypassword12", "superman1234",
  "starwars1234", "1234qwerasdf", "q1w2e3r4t5y6", "987654321098",
]);

export function isCommonPassword(password: string): boolean {
  return COMMON.has(password.toLowerCase());
}

export const PasswordSchema = v.pipe(
  v.string("Enter a password."),
  v.minLength(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters; a few words together are easy to remember.`),
  v.maxLength(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`),
  v.check((p) => !isCommonPassword(p), "This password is one of the most common ones; choose another."),
);

export const EmailSchema = v.pipe(
  v.string("Enter an e-mail address."),
  v.trim(),
  v.nonEmpty("Enter an e-mail address."),
  v.maxLength(254, "This e-mail address is too long."),
  v.email("Enter a valid e-mail address, like name@example.com."),
  v.toLowerCase(),
);

export const PersonNameSchema = v.pipe(
  v.string("Enter a name."),
  v.trim(),
  v.nonEmpty("Enter a name."),
  v.maxLength(120, "Use at most 120 characters."),
);
