#!/usr/bin/env bash
# Fails when api/openapi.json or the contract's generated types no longer match what the built api describes:
# a route or DTO changed without `npm run openapi -w api && npm run api-types -w @evenhand/contract`.
set -euo pipefail
contract="$(cd "$(dirname "$0")" && pwd)"
api="$(dirname "$contract")"
scratch="$(mktemp -d)"
trap 'rm -rf "$scratch"' EXIT
(cd "$api" && node dist/openapi/write-openapi.js "$scratch/openapi.json" >/dev/null)
"$contract/../../node_modules/.bin/openapi-typescript" "$scratch/openapi.json" -o "$scratch/api-schema.ts" >/dev/null 2>&1
status=0
if ! diff -q "$scratch/openapi.json" "$api/openapi.json" >/dev/null; then
  echo "api/openapi.json is out of date: run npm run build -w api && npm run openapi -w api" >&2
  diff "$scratch/openapi.json" "$api/openapi.json" | head -20 >&2
  status=1
fi
if ! diff -q "$scratch/api-schema.ts" "$contract/src/generated/api-schema.ts" >/dev/null; then
  echo "api/contract/src/generated/api-schema.ts is out of date: run npm run api-types -w @evenhand/contract" >&2
  diff "$scratch/api-schema.ts" "$contract/src/generated/api-schema.ts" | head -20 >&2
  status=1
fi
[ "$status" = 0 ] && echo "The contract matches the api."
exit "$status"
