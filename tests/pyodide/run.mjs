// Runs main.py (written for xlwings Lite) in Pyodide under Node.js, offline.
//
//   node tests/pyodide/run.mjs CASES.json WHEEL_DIR MAIN.py STAND_IN_DIR
//
// Loads Pyodide from this directory's node_modules (npm ci), unpacks every
// wheel of WHEEL_DIR into site-packages with Python's zipfile (no micropip, no
// network: fetch is replaced by a function that throws), puts STAND_IN_DIR
// first on sys.path (the recording stand-in for xlwings, and lite_harness.py),
// imports MAIN.py as the module `main` and calls every case through
// lite_harness.run. Prints one JSON object on stdout:
//   {"timings": {load_pyodide_ms, install_ms, import_main_ms, first_call_ms, calls, calls_ms},
//    "python", "platform", "versions", "results": [{id, value | error, type}], "declared": [...]}
// Python's own output goes to stderr.

import fs from "node:fs";
import path from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { performance } from "node:perf_hooks";

const here = path.dirname(fileURLToPath(import.meta.url));
const indexDir = path.join(here, "node_modules", "pyodide");

function usage(message) {
  process.stderr.write(`${message}\nusage: node run.mjs CASES.json WHEEL_DIR MAIN.py STAND_IN_DIR\n`);
  process.exit(2);
}

// Copies a directory of the machine into Pyodide's file system.
function copyTree(pyodide, from, to) {
  pyodide.FS.mkdirTree(to);
  for (const entry of fs.readdirSync(from, { withFileTypes: true })) {
    if (entry.name === "__pycache__") continue;
    const source = path.join(from, entry.name);
    const target = `${to}/${entry.name}`;
    if (entry.isDirectory()) copyTree(pyodide, source, target);
    else if (entry.isFile()) pyodide.FS.writeFile(target, fs.readFileSync(source));
  }
}

async function main() {
  const [casesPath, wheelDir, mainPath, standInDir] = process.argv.slice(2);
  if (!standInDir) usage("four arguments are needed");
  if (!fs.existsSync(path.join(indexDir, "pyodide.mjs"))) {
    usage(`no Pyodide at ${indexDir}: run tests/pyodide/setup.sh (npm ci) first`);
  }
  const wheels = fs.readdirSync(wheelDir).filter((name) => name.endsWith(".whl")).sort();
  if (wheels.length === 0) usage(`no .whl files in ${wheelDir}`);

  // Offline by construction: Pyodide reads its files from indexURL with node's fs; any fetch is a fault.
  globalThis.fetch = async (url) => {
    throw new Error(`network access attempted from the Pyodide test: ${url}`);
  };

  const t0 = performance.now();
  const { loadPyodide } = await import(pathToFileURL(path.join(indexDir, "pyodide.mjs")).href);
  const pyodide = await loadPyodide({
    indexURL: indexDir + path.sep,
    stdout: (line) => process.stderr.write(`${line}\n`),
    stderr: (line) => process.stderr.write(`${line}\n`),
  });
  const t1 = performance.now();

  pyodide.FS.mkdirTree("/wheels");
  for (const name of wheels) {
    pyodide.FS.writeFile(`/wheels/${name}`, fs.readFileSync(path.join(wheelDir, name)));
  }
  pyodide.runPython(`
import importlib, os, sysconfig, zipfile
_site = sysconfig.get_path("purelib")
for _name in sorted(os.listdir("/wheels")):
    with zipfile.ZipFile("/wheels/" + _name) as _zf:
        _zf.extractall(_site)
importlib.invalidate_caches()
del _site, _name, _zf
`);
  const t2 = performance.now();

  copyTree(pyodide, standInDir, "/stand_in");
  pyodide.FS.mkdirTree("/home/pyodide");
  pyodide.FS.writeFile("/home/pyodide/main.py", fs.readFileSync(mainPath));
  pyodide.globals.set("cases_json", fs.readFileSync(casesPath, "utf8"));
  const answer = pyodide.runPython(`
import sys
sys.path.insert(0, "/stand_in")
import lite_harness
lite_harness.run_json("/home/pyodide/main.py", cases_json)
`);
  const out = JSON.parse(answer);
  out.timings = {
    load_pyodide_ms: t1 - t0,
    install_ms: t2 - t1,
    ...out.timings,
  };
  out.wheels = wheels;
  out.pyodide = pyodide.version;
  process.stdout.write(`${JSON.stringify(out)}\n`);
}

main().catch((error) => {
  process.stderr.write(`${error && error.stack ? error.stack : error}\n`);
  process.exit(1);
});
