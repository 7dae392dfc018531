/** Help texts of the `fieldbook` command, one per verb, with examples. */

export const VERBS = ["run", "check", "compute", "build", "verify", "new"];

export const HELP: Record<string, string> = {
  main: `fieldbook — Hartree–Fock and MP2 calculations as a versioned, checkable archive

Usage: fieldbook <command> [options]     (npx fieldbook … inside the repository)

Commands:
  run <spec.yaml>     compute one spec now and print a summary (--json: the record)
  check [paths…]      validate every spec (default: calculations/); lists all errors
  compute             compute the specs that have no record yet (--jobs N, --shard K/N)
  build               compute, then build the site into dist/
  verify [ids…]       recompute archived records and report every number that moved
  new <file.xyz>      start a spec from an XYZ file

Run "fieldbook <command> --help" for details and examples.
Hartree–Fock and MP2 are approximations; validate results before relying on them.
`,
  run: `Usage: fieldbook run <spec.yaml> [--json]

Computes one spec immediately (no record is written) and prints what was computed, the
energies with units, convergence, the built-in consistency checks and the spec's checks.

  --json    print the full record as JSON instead of the summary

Examples:
  fieldbook run calculations/water/monomer.yaml
  fieldbook run calculations/water/monomer.yaml --json > water.json
`,
  check: `Usage: fieldbook check [paths…]

Validates specs (default: every .yaml under calculations/) without computing anything and
lists every problem with file:line:column, what was expected and a hint. Exits non-zero if
any spec has an error.

Examples:
  fieldbook check
  fieldbook check calculations/water
`,
  compute: `Usage: fieldbook compute [--jobs N] [--shard K/N]

Finds the specs whose input hash has no record in content/records/ and computes them in a
pool of worker threads, writing one record per calculation (atomically; existing records are
never changed). Failed and non-converged runs are recorded too.

  --jobs N     worker threads (default: the number of available cores)
  --shard K/N  compute only the K-th of N deterministic slices of the pending work, so that
               a cluster job array or a CI matrix can split an archive; records from the
               shards merge by copying files

Examples:
  fieldbook compute --jobs 2
  fieldbook compute --shard 3/8
`,
  build: `Usage: fieldbook build [--jobs N]

Computes what is missing (as "compute"), then builds the static site into dist/.

Example:
  fieldbook build
`,
  verify: `Usage: fieldbook verify [ids…]

Recomputes every archived record (all versions, or those of the given ids) from its own
archived spec with the current engine, and reports every number that moved beyond its
tolerance (energies 1e-8 Eh, dipole and charges 1e-6 au). A record that did not converge
is reproduced when the run again does not converge; its unconverged numbers are not compared.
Exits non-zero on any difference. This is the reproducibility check a referee would ask for.

Examples:
  fieldbook verify
  fieldbook verify water/monomer
`,
  new: `Usage: fieldbook new <file.xyz> [--out path] [--title text] [--basis name] [--charge n]

Writes a spec to start from: the geometry inline, RHF for a closed shell (UHF with the
lowest multiplicity otherwise), cc-pVDZ, no correlation. Prints it, or writes it with --out.

Example:
  fieldbook new geometries/ethanol.xyz --out calculations/ethanol/rhf.yaml
`,
};
