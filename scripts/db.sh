#!/usr/bin/env bash
# A private MariaDB for Faultline, inside the project (.data/mariadb), on 127.0.0.1 only.
#   scripts/db.sh ensure   install (Debian packages) if missing, initialise, start, create DBs and user
#   scripts/db.sh start | stop | status
set -euo pipefail
cd "$(dirname "$0")/.."
ROOT=$PWD
D="$ROOT/.data/mariadb"
SOCK="$D/mysqld.sock"
PORT="${DB_PORT:-3307}"
SECRETS="$ROOT/.data/secrets.env"
export PATH="$PATH:/usr/sbin:/usr/local/sbin:/sbin"

sudo_if_needed() { if [ "$(id -u)" = 0 ]; then "$@"; else sudo "$@"; fi; }

install_mariadb() {
  if command -v mariadbd >/dev/null 2>&1 && command -v mariadb >/dev/null 2>&1; then return; fi
  echo "• Installing MariaDB from Debian's packages (one time)…"
  sudo_if_needed apt-get update -qq
  sudo_if_needed env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends mariadb-server-core mariadb-client >/dev/null
}

ensure_secrets() {
  mkdir -p "$ROOT/.data"
  if [ ! -f "$SECRETS" ]; then
    umask 077
    {
      echo "DB_PASSWORD=$(head -c 24 /dev/urandom | base64 | tr -dc 'A-Za-z0-9' | head -c 24)"
      echo "SESSION_SECRET=$(head -c 48 /dev/urandom | base64 | tr -dc 'A-Za-z0-9' | head -c 48)"
    } > "$SECRETS"
  fi
}

ping_db() { mariadb-admin --no-defaults -S "$SOCK" -u"$(id -un)" --connect-timeout=1 ping >/dev/null 2>&1; }

start_db() {
  install_mariadb
  if [ ! -d "$D/data/mysql" ]; then
    echo "• Initialising the private database in .data/mariadb…"
    mkdir -p "$D/data"
    # --no-defaults must come first, or /etc/mysql's settings (port 3306) are read.
    mariadb-install-db --no-defaults --datadir="$D/data" --user="$(id -un)" \
      --auth-root-authentication-method=socket --skip-test-db --skip-name-resolve >"$D/install.log" 2>&1
  fi
  if ping_db; then return; fi
  rm -f "$SOCK"
  local as_user=()
  [ "$(id -u)" = 0 ] && as_user=(--user=root)
  nohup mariadbd --no-defaults "${as_user[@]}" --datadir="$D/data" --socket="$SOCK" \
    --pid-file="$D/mysqld.pid" --port="$PORT" --bind-address=127.0.0.1 --log-error="$D/mysqld.err" \
    --skip-name-resolve --character-set-server=utf8mb4 --collation-server=utf8mb4_unicode_ci \
    --innodb-flush-log-at-trx-commit=1 --max-connections=300 \
    >>"$D/stdout.log" 2>&1 </dev/null &
  for _ in $(seq 300); do ping_db && return; sleep 0.1; done
  echo "MariaDB did not start; see $D/mysqld.err" >&2
  tail -20 "$D/mysqld.err" >&2 || true
  exit 1
}

create_databases() {
  ensure_secrets
  # The database superuser is the OS user who initialised it (unix_socket authentication).
  # shellcheck disable=SC1090
  . "$SECRETS"
  mariadb --no-defaults -S "$SOCK" -u"$(id -un)" <<SQL
CREATE DATABASE IF NOT EXISTS faultline CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE DATABASE IF NOT EXISTS faultline_test CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;
CREATE USER IF NOT EXISTS 'faultline'@'127.0.0.1' IDENTIFIED BY '$DB_PASSWORD';
CREATE USER IF NOT EXISTS 'faultline'@'localhost' IDENTIFIED BY '$DB_PASSWORD';
ALTER USER 'faultline'@'127.0.0.1' IDENTIFIED BY '$DB_PASSWORD';
ALTER USER 'faultline'@'localhost' IDENTIFIED BY '$DB_PASSWORD';
GRANT ALL PRIVILEGES ON faultline.* TO 'faultline'@'127.0.0.1', 'faultline'@'localhost';
GRANT ALL PRIVILEGES ON faultline_test.* TO 'faultline'@'127.0.0.1', 'faultline'@'localhost';
-- Scratch databases named faultline_* (benchmarks, fresh-install checks) belong to the app user too.
GRANT ALL PRIVILEGES ON \`faultline\\_%\`.* TO 'faultline'@'127.0.0.1', 'faultline'@'localhost';
FLUSH PRIVILEGES;
SQL
}

stop_db() {
  if ping_db; then
    mariadb-admin --no-defaults -S "$SOCK" -u"$(id -un)" shutdown
    echo "• MariaDB stopped."
  else
    echo "• MariaDB is not running."
  fi
}

case "${1:-ensure}" in
  ensure) start_db; create_databases ;;
  start) start_db ;;
  stop) stop_db ;;
  status)
    if ping_db; then
      # Ask the server itself: DB_PORT in the environment may not be the port it was started on.
      actual=$(mariadb --no-defaults -S "$SOCK" -u"$(id -un)" -N -B -e 'SELECT @@port')
      echo "running on 127.0.0.1:$actual"
    else
      echo "stopped"
      exit 1
    fi
    ;;
  *) echo "usage: $0 ensure|start|stop|status" >&2; exit 2 ;;
esac
