#!/usr/bin/env bash
# Secrets per install: the database passwords, the session key and the ledger
# key are generated into .env.local (ignored by git) on first run and reused on
# every later run. Sourced by prepare.sh and mariadb.sh; expects ROOT.
# Variables already set in the environment win over the file, as in Next.

LOCAL_ENV_FILE="$ROOT/.env.local"
LOCAL_SECRETS=(DATABASE_PASSWORD DATABASE_OWNER_PASSWORD NEXTAUTH_SECRET LEDGER_HMAC_KEY)

# 32 random bytes, base64url without padding (43 characters, no quoting needed).
random_secret() { head -c 32 /dev/urandom | base64 -w0 | tr '+/' '-_' | tr -d '='; }

# Adds each missing secret to .env.local; keeps the ones already there.
ensure_local_env() {
  local key
  if [ ! -f "$LOCAL_ENV_FILE" ]; then
    (umask 077 && printf '%s\n' \
      "# Generated for this install by db/scripts/secrets.sh; never commit it." \
      "# Delete a line to have it generated again (the database accounts follow)." \
      >"$LOCAL_ENV_FILE")
  fi
  for key in "${LOCAL_SECRETS[@]}"; do
    if ! grep -q "^$key=" "$LOCAL_ENV_FILE"; then
      printf '%s=%s\n' "$key" "$(random_secret)" >>"$LOCAL_ENV_FILE" || return 1
    fi
  done
}

# Exports KEY=VALUE lines of .env.local that the environment does not set yet.
# Parsed, not sourced, so the file is data and not shell code.
load_local_env() {
  local line key value
  [ -f "$LOCAL_ENV_FILE" ] || return 0
  while IFS= read -r line || [ -n "$line" ]; do
    [[ "$line" =~ ^[[:space:]]*([A-Za-z_][A-Za-z0-9_]*)=(.*)$ ]] || continue
    key="${BASH_REMATCH[1]}"
    value="${BASH_REMATCH[2]}"
    if [[ "$value" =~ ^\"(.*)\"$ ]] || [[ "$value" =~ ^\'(.*)\'$ ]]; then value="${BASH_REMATCH[1]}"; fi
    if [ -z "${!key+set}" ]; then export "$key=$value"; fi
  done <"$LOCAL_ENV_FILE"
}
