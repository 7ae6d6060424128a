#!/bin/sh
# The solve CLI's entry: what `npm run solve` runs and the command to quote, e.g.
#   server/cli/solve.sh f.json --json
# It runs node on solve-launcher.cjs (what `node server/cli/solve-launcher.mjs` runs, as a CommonJS
# entry: see launcher.cjs) with the same arguments, and with one difference a JavaScript entry
# cannot make, because node acts on it before any script runs: NODE_EXTRA_CA_CERTS is unset.
# When it is set (this project's machines set it to the system's whole CA bundle,
# /etc/ssl/certs/ca-certificates.crt), node 20 reads and parses every certificate in it at
# start-up, before the first line of JavaScript: measured on this machine, `node -e 0` took
# ~160 ms with it and ~90 ms without on a quiet machine, and 170 against 110 ms of CPU at load
# ~1-13 (2 December 2026): a third of the 10-element file's whole run.
# The solve CLI opens no network connection, so the certificates are never used.
#
# Plain POSIX sh, no external command: `exec` replaces this shell with node (same process id,
# exit code and signals, standard streams untouched).
unset NODE_EXTRA_CA_CERTS
case $0 in
  */*) dir=${0%/*} ;;
  *) dir=. ;;
esac
exec node "$dir/solve-launcher.cjs" "$@"
