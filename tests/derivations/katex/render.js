// Render each LaTeX source of a JSON array (stdin) with KaTeX in strict mode.
// An element is a string (display math) or {"tex": string, "inline": true} (inline math, as a
// notebook's $...$ display).  Prints a JSON array of {ok, error} objects; exit code 0 even when
// some fail.
const katex = require("katex");
let input = "";
process.stdin.on("data", (chunk) => { input += chunk; });
process.stdin.on("end", () => {
  const results = JSON.parse(input).map((item) => {
    const tex = typeof item === "string" ? item : item.tex;
    const inline = typeof item === "object" && item !== null && item.inline === true;
    try {
      katex.renderToString(tex, { displayMode: !inline, throwOnError: true, strict: "error" });
      return { ok: true, error: null };
    } catch (err) {
      return { ok: false, error: String(err.message || err) };
    }
  });
  process.stdout.write(JSON.stringify(results));
});
