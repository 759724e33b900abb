// Render each LaTeX string of a JSON array (stdin) with KaTeX in strict mode.
// Prints a JSON array of {ok, error} objects; exit code 0 even when some fail.
const katex = require("katex");
let input = "";
process.stdin.on("data", (chunk) => { input += chunk; });
process.stdin.on("end", () => {
  const results = JSON.parse(input).map((tex) => {
    try {
      katex.renderToString(tex, { displayMode: true, throwOnError: true, strict: "error" });
      return { ok: true, error: null };
    } catch (err) {
      return { ok: false, error: String(err.message || err) };
    }
  });
  process.stdout.write(JSON.stringify(results));
});
