#!/usr/bin/env bash
# A 1 GB upload over loopback: the app (multipart through multer, hashed, stored) against a bare
# Node server writing the same bytes to disk while hashing. Prints the throughput ratio and the
# app server's peak memory growth. Usage: upload.sh APP_URL SERVER_PID DATA_DIR
set -euo pipefail
APP="$1"; PID="$2"; DIR="$3"
FILE="$DIR/bench-1g.mp4"
if [ ! -s "$FILE" ] || [ "$(stat -c %s "$FILE")" -lt 1073741824 ]; then
  # An MP4 "ftyp" box first, so the content passes as video, then 1 GiB of random bytes.
  { printf '\x00\x00\x00\x18ftypmp42\x00\x00\x00\x00mp42isom'; head -c 1073741824 /dev/urandom; } >"$FILE"
fi
SIZE=$(stat -c %s "$FILE")
COOKIE=$(curl -s -o /dev/null -c - -H 'content-type: application/json' -d '{"email":"organiser@trapline.test","password":"trapline-demo"}' "$APP/api/auth/login" | awk '/nuxt-session/ {print $7}')
EVENT=$(curl -s -b "nuxt-session=$COOKIE" "$APP/api/events" | node -e "let s='';process.stdin.on('data',d=>s+=d).on('end',()=>console.log(JSON.parse(s)[0].id))")

BARE_PORT=$((RANDOM % 1000 + 38000))
node "$(dirname "$0")/bare-upload-server.mjs" "$BARE_PORT" "$DIR/bench-bare.out" >/dev/null &
BARE=$!
sleep 0.5
BARE_T=$(curl -s -o /dev/null -w '%{time_total}' -H 'Expect:' -X POST -T "$FILE" -H 'content-type: application/octet-stream' "http://127.0.0.1:$BARE_PORT/")
kill $BARE; rm -f "$DIR/bench-bare.out"

rss() { awk '/VmRSS/ {print $2}' "/proc/$PID/status"; }
BASE=$(rss); PEAK=$BASE
( while kill -0 "$PID" 2>/dev/null; do r=$(rss); echo "$r"; sleep 0.1; done ) >"$DIR/bench-rss.log" &
WATCH=$!
APP_T=$(curl -s -H 'Expect:' -o "$DIR/bench-app-response.json" -w '%{time_total}' -b "nuxt-session=$COOKIE" -F kind=video -F "file=@$FILE;type=video/mp4" "$APP/api/events/$EVENT/evidence")
kill $WATCH 2>/dev/null || true
PEAK=$(sort -n "$DIR/bench-rss.log" | tail -1)



node -e "
const [size, app, bare, base, peak] = process.argv.slice(1).map(Number)
const mb = size / 1048576
console.log('upload of ' + mb.toFixed(0) + ' MiB: app ' + app.toFixed(2) + ' s (' + (mb / app).toFixed(0) + ' MiB/s), bare Node ' + bare.toFixed(2) + ' s (' + (mb / bare).toFixed(0) + ' MiB/s), ratio ' + (bare / app).toFixed(2) + '; app server memory growth ' + ((peak - base) / 1024).toFixed(1) + ' MiB (RSS ' + (base / 1024).toFixed(0) + ' → ' + (peak / 1024).toFixed(0) + ' MiB)')
" "$SIZE" "$APP_T" "$BARE_T" "$BASE" "$PEAK"
grep -q '"sha256"' "$DIR/bench-app-response.json" || { echo "the app refused the upload:"; cat "$DIR/bench-app-response.json"; }
