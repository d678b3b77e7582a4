/**
 * A small bundled list of passwords that are used so often that any guesser tries them first.
 * Compiled from memory of the words that head the published frequency lists of leaked passwords
 * (no list was copied); the policy also refuses them with digits or symbols added around them and
 * with the usual letter-for-digit swaps (p@ssw0rd), so the list holds base words and a few
 * frequent long forms. Lower case, no blanks.
 */
export const COMMON_PASSWORDS: ReadonlySet<string> = new Set([
  "password", "passw0rd", "passwort", "motdepasse", "contraseña", "senha", "parola", "wachtwoord", "haslo", "salasana",
  "123456", "1234567", "12345678", "123456789", "1234567890", "0987654321", "1111111111", "0000000000", "1122334455", "1234512345",
  "123123123", "123321123321", "147258369", "159753", "7777777", "987654321", "5201314", "qwerty", "qwertyuiop", "qwerty123",
  "asdfghjkl", "zxcvbnm", "1q2w3e4r5t", "1qaz2wsx", "qazwsx", "abc123", "abcd1234", "aa123456", "a1b2c3d4", "iloveyou",
  "letmein", "welcome", "monkey", "dragon", "master", "shadow", "sunshine", "princess", "football", "baseball",
  "soccer", "hockey", "basketball", "superman", "batman", "spiderman", "starwars", "pokemon", "minecraft", "trustno1",
  "michael", "jennifer", "jordan", "hunter", "harley", "ranger", "buster", "thomas", "robert", "daniel",
  "charlie", "jessica", "ashley", "amanda", "andrew", "joshua", "matthew", "nicole", "hannah", "jasmine",
  "michelle", "tigger", "pepper", "ginger", "cookie", "chocolate", "cheese", "banana", "summer", "winter",
  "freedom", "whatever", "secret", "access", "login", "admin", "administrator", "root", "toor", "changeme",
  "default", "guest", "test", "testing", "qwerty1", "computer", "internet", "samsung", "google", "apple",
  "flower", "lovely", "loveme", "mylove", "babygirl", "angel", "friends", "family", "forever", "hello",
  "helloworld", "killer", "mustang", "corvette", "ferrari", "porsche", "mercedes", "yankees", "liverpool", "chelsea",
  "arsenal", "barcelona", "madrid", "london", "paris", "berlin", "america", "canada", "blink182", "metallica",
  "nirvana", "matrix", "zaq12wsx", "passpass", "letmein123", "welcome123", "password123", "password1234", "admin123", "iloveyou123",
  "abcdefghij", "abcdefg123", "qwertyuiop123", "q1w2e3r4t5", "1q2w3e4r", "asdf1234", "zaq1zaq1", "superstar", "rockstar", "maverick",
  "phoenix", "diamond", "silver", "golden", "orange", "purple", "yellow", "chicken", "monster", "dolphin",
  "butterfly", "sweetheart", "beautiful", "baby123", "blessed", "heaven", "whatsup", "trustme", "nothing", "anything", "someone",
]);
