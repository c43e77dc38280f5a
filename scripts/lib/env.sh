# shellcheck shell=bash
# The environment the API, the fakes and the tests read (see .env.example for each key).

# A first `npm start` gets its own .env with a fresh signing secret; .env is git-ignored.
ensure_env_file() {
  local file="$HB_ROOT/.env"
  [ -f "$file" ] && return 0
  [ -f "$HB_ROOT/.env.example" ] || die ".env.example is missing"
  local secret
  secret=$(node -e 'process.stdout.write(require("node:crypto").randomBytes(48).toString("base64url"))')
  (umask 077 && sed "s|^JWT_SECRET=.*|JWT_SECRET=$secret|" "$HB_ROOT/.env.example" >"$file")
  note "wrote .env with a new JWT_SECRET"
}

# Exports KEY=VALUE lines of a dotenv file. As with dotenv, a variable already in the
# environment wins. Values are taken literally (no expansion); one pair of quotes is removed.
load_env_file() {
  local file=$1 line key value
  [ -f "$file" ] || return 0
  while IFS= read -r line || [ -n "$line" ]; do
    line=${line%$'\r'}
    [[ "$line" =~ ^[[:space:]]*(export[[:space:]]+)?([A-Za-z_][A-Za-z0-9_]*)=(.*)$ ]] || continue
    key=${BASH_REMATCH[2]}
    value=${BASH_REMATCH[3]}
    if [[ "$value" =~ ^\"(.*)\"$ ]] || [[ "$value" =~ ^\'(.*)\'$ ]]; then
      value=${BASH_REMATCH[1]}
    fi
    [ -n "${!key+x}" ] || export "$key=$value"
  done <"$file"
}

print_env_summary() {
  local key
  for key in NODE_ENV HOST PORT APP_URL DATABASE_URL SMTP_HOST SMTP_PORT MAIL_FROM MAIL_CATCHER_URL WEB_DIST LOG_LEVEL; do
    note "$key=${!key:-}"
  done
  note "JWT_SECRET=(${#JWT_SECRET} characters, not shown)"
}

# Points card deposits at the local Stripe fake (apps/api/src/fakes/stripe-fake.ts): test-mode keys only,
# never a real one. A webhook secret from the shell or .env wins; otherwise each run makes its own.
stripe_fake_env() {
  STRIPE_API_HOST=127.0.0.1
  STRIPE_API_PORT=$(pick_port "${STRIPE_API_PORT:-12111}")
  : "${STRIPE_SECRET_KEY:=sk_test_local_fake}"
  [ -n "${STRIPE_WEBHOOK_SECRET:-}" ] || STRIPE_WEBHOOK_SECRET="whsec_local_$(random_hex 16)"
  STRIPE_WEBHOOK_URL="$APP_URL/api/payments/stripe-webhook"
  export STRIPE_API_HOST STRIPE_API_PORT STRIPE_SECRET_KEY STRIPE_WEBHOOK_SECRET STRIPE_WEBHOOK_URL
}

# Photos go to the local S3 fake and web pushes can be sent to the local push fake (apps/api/src/fakes).
# An S3_ENDPOINT from the shell or .env (real object storage) wins. VAPID keys are generated here, never
# real ones: with "persist" (npm start) they are written to .env once, so phones stay subscribed.
# Usage: crew_phone_fake_env S3_DIR [persist]
crew_phone_fake_env() {
  S3_FAKE_DIR=$1
  S3_FAKE_PORT=$(pick_port "${S3_FAKE_PORT:-4569}")
  PUSH_FAKE_PORT=$(pick_port "${PUSH_FAKE_PORT:-4570}")
  : "${S3_ENDPOINT:=http://127.0.0.1:$S3_FAKE_PORT}" "${S3_BUCKET:=hodboard-photos}"
  if [ -z "${VAPID_PUBLIC_KEY:-}" ] || [ -z "${VAPID_PRIVATE_KEY:-}" ]; then
    local keys
    keys=$(cd "$HB_ROOT/apps/api" && node -e 'const k = require("web-push").generateVAPIDKeys(); console.log(`${k.publicKey} ${k.privateKey}`)')
    VAPID_PUBLIC_KEY=${keys% *}
    VAPID_PRIVATE_KEY=${keys#* }
    if [ "${2:-}" = persist ] && [ -f "$HB_ROOT/.env" ]; then
      printf '\nVAPID_PUBLIC_KEY=%s\nVAPID_PRIVATE_KEY=%s\n' "$VAPID_PUBLIC_KEY" "$VAPID_PRIVATE_KEY" >>"$HB_ROOT/.env"
      note "added generated VAPID keys to .env"
    fi
  fi
  export S3_FAKE_DIR S3_FAKE_PORT PUSH_FAKE_PORT S3_ENDPOINT S3_BUCKET VAPID_PUBLIC_KEY VAPID_PRIVATE_KEY
}
