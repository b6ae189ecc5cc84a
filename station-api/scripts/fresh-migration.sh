#!/usr/bin/env bash
# Regenerates the single initial migration from the current entities (pre-release only:
# once a database has been deployed, add a new migration with `npm run db:migration:create` instead).
set -euo pipefail
cd "$(dirname "$0")/.."
tmp=$(mktemp -d)
rm -f src/database/migrations/Migration*.ts src/database/migrations/.snapshot-railwright.json
rm -rf dist
npx tsc -p tsconfig.build.json
DATABASE_PATH="$tmp/fresh.sqlite" npx mikro-orm migration:create --initial
rm -rf dist "$tmp"
npx tsc -p tsconfig.build.json
echo "Initial migration regenerated in src/database/migrations"
