/**
 * The next revision letter, A → B → … → Z → AA (the same rule as the server's nextRevision in
 * lib/calculations/workflow.ts, which cannot be imported into the browser bundle).
 */
export function nextRevisionLetter(rev: string): string {
  const letters = rev.toUpperCase().split("");
  for (let i = letters.length - 1; i >= 0; i--) {
    if (letters[i] !== "Z") {
      letters[i] = String.fromCharCode(letters[i].charCodeAt(0) + 1);
      return letters.join("");
    }
    letters[i] = "A";
  }
  return "A" + letters.join("");
}
