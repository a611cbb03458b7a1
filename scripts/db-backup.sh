#!/usr/bin/env bash
# Consistent online backup of a Faultline database (InnoDB, no locks held while it runs).
#   scripts/db-backup.sh [database] [file]     default: faultline → backups/faultline-<UTC time>.sql.gz
set -euo pipefail
cd "$(dirname "$0")/.."
export PATH="$PATH:/usr/sbin:/usr/local/sbin:/sbin"
DB="${1:-faultline}"
mkdir -p backups
FILE="${2:-backups/$DB-$(date -u +%Y%m%dT%H%M%SZ).sql.gz}"
mariadb-dump --no-defaults -S .data/mariadb/mysqld.sock -u"$(id -un)" \
  --single-transaction --quick --routines --triggers --hex-blob --databases "$DB" | gzip > "$FILE.partial"
mv "$FILE.partial" "$FILE"   # a half-written dump never carries the final name
echo "$FILE"
