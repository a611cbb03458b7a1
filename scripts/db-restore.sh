#!/usr/bin/env bash
# Restores a backup made by db-backup.sh into a database (created or replaced).
#   scripts/db-restore.sh <file.sql.gz> [target database]    default target: the one in the dump
set -euo pipefail
cd "$(dirname "$0")/.."
export PATH="$PATH:/usr/sbin:/usr/local/sbin:/sbin"
FILE="$1"
TARGET="${2:-}"
SOCK=.data/mariadb/mysqld.sock
if [ -n "$TARGET" ]; then
  SOURCE=$(gunzip -c "$FILE" | sed -n 's/^CREATE DATABASE .*`\([^`]*\)`.*/\1/p' | head -1)
  mariadb --no-defaults -S "$SOCK" -u"$(id -un)" -e "DROP DATABASE IF EXISTS \`$TARGET\`; CREATE DATABASE \`$TARGET\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci"
  # Strip the dump's own CREATE DATABASE / USE so the rows land in the target.
  gunzip -c "$FILE" | sed -e "/^CREATE DATABASE /d" -e "/^USE \`$SOURCE\`;/d" | mariadb --no-defaults -S "$SOCK" -u"$(id -un)" "$TARGET"
else
  gunzip -c "$FILE" | mariadb --no-defaults -S "$SOCK" -u"$(id -un)"
fi
echo "restored $FILE${TARGET:+ into $TARGET}"
