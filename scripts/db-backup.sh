#!/usr/bin/env bash
# Consistent online backup of a Faultline database (InnoDB, no locks held while it runs).
#   scripts/db-backup.sh [database] [file]     default: faultline → $BACKUP_DIR (backups/)/faultline-<UTC time>.sql.gz
# Files are written 600, the default folder 700.
set -euo pipefail
cd "$(dirname "$0")/.."
export PATH="$PATH:/usr/sbin:/usr/local/sbin:/sbin"
DB="${1:-faultline}"
# The dump holds password hashes and live sessions: only this user may read it.
umask 077
if [ -n "${2:-}" ]; then
  FILE="$2"
else
  DIR="${BACKUP_DIR:-backups}"
  mkdir -p "$DIR"
  chmod 700 "$DIR"
  FILE="$DIR/$DB-$(date -u +%Y%m%dT%H%M%SZ).sql.gz"
fi
mariadb-dump --no-defaults -S .data/mariadb/mysqld.sock -u"$(id -un)" \
  --single-transaction --quick --routines --triggers --hex-blob --databases "$DB" | gzip > "$FILE.partial"
mv "$FILE.partial" "$FILE"   # a half-written dump never carries the final name
echo "$FILE"
