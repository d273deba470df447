#!/usr/bin/env bash
# A dossier for an attempt with 40 readings and 20 evidence files of about 1 GB in all: build time
# and the app server's peak memory. Usage: dossier.sh APP_URL SERVER_PID DATA_DIR DATABASE_URL PSQL
set -euo pipefail
APP="$1"; PID="$2"; DIR="$3"; DB="$4"; PSQL="$5"
login() { curl -s -o /dev/null -c - -H 'content-type: application/json' -d "{\"email\":\"$1\",\"password\":\"trapline-demo\"}" "$APP/api/auth/login" | awk '/nuxt-session/ {print $7}'; }
TEAM=$(login team@trapline.test)
ATTEMPT=$("$PSQL" "$DB" -tAc "select a.id from attempts a join entries e on e.id = a.entry_id join teams t on t.id = e.team_id where t.name = 'Larkspur Works' order by a.id limit 1")
RUN=$("$PSQL" "$DB" -tAc "select id from runs where attempt_id = $ATTEMPT order by id limit 1")
# The demo's timing sheet of that attempt is signed: the timekeeper reopens it (signed, with a reason) so that
# corrections can be appended, and signs it again after them, as on the day.
TK=$(login timekeeper@trapline.test)
TK_NAME=$("$PSQL" "$DB" -tAc "select name from users where email = 'timekeeper@trapline.test'")
sign_sheet() { # sign_sheet PATH EXTRA_JSON
  local code
  code=$(curl -s -o "$DIR/bench-sign.json" -w '%{http_code}' -H 'content-type: application/json' -b "nuxt-session=$TK" \
    -d "{\"password\":\"trapline-demo\",\"typedName\":\"$TK_NAME\"$2}" "$APP/api/attempts/$ATTEMPT/$1")
  [ "$code" = 201 ] || { echo "the timing sheet could not be signed ($1): $code $(cat "$DIR/bench-sign.json")"; exit 1; }
}
sign_sheet reopen ',"reason":"bench: corrections to append"'
# 24 more readings (corrections appended to the first run's), for 40 in all.
"$PSQL" "$DB" -qc "insert into readings (run_id, trap_id, system_id, ticks, supersedes_id, reason, entered_by)
  select run_id, trap_id, system_id, ticks + 1, id, 'bench correction', entered_by from readings x
  where run_id in (select id from runs where attempt_id = $ATTEMPT) and not exists (select 1 from readings s where s.supersedes_id = x.id) limit 16"
"$PSQL" "$DB" -qc "insert into readings (run_id, trap_id, system_id, ticks, supersedes_id, reason, entered_by)
  select run_id, trap_id, system_id, ticks + 1, id, 'bench correction', entered_by from readings x
  where run_id in (select id from runs where attempt_id = $ATTEMPT) and supersedes_id is not null and not exists (select 1 from readings s where s.supersedes_id = x.id) limit 8"
sign_sheet signatures ''
echo "readings of the attempt: $("$PSQL" "$DB" -tAc "select count(*) from readings where run_id in (select id from runs where attempt_id = $ATTEMPT)")"
# 19 files of 1 to 3 MB and the 1 GB video, attached to the run.
for i in $(seq 1 19); do
  node -e "const n = Number(process.argv[1]); let s = 't_s,kmh\\n'; for (let t = 0; s.length < n; t++) s += (t / 100).toFixed(2) + ',' + (390 + Math.random() * 15).toFixed(3) + '\\n'; require('fs').writeFileSync(process.argv[2], s)" $(( (i % 3 + 1) * 1024 * 1024 )) "$DIR/bench-log-$i.csv"
  curl -s -o /dev/null -b "nuxt-session=$TEAM" -F kind=data-log -F "runId=$RUN" -F "file=@$DIR/bench-log-$i.csv;type=text/csv" "$APP/api/events/1/evidence"
  rm -f "$DIR/bench-log-$i.csv"
done
curl -s -o /dev/null -H 'Expect:' -b "nuxt-session=$TEAM" -F kind=video -F "runId=$RUN" -F "file=@$DIR/bench-1g.mp4;type=video/mp4" "$APP/api/events/1/evidence"
echo "evidence in the dossier: $("$PSQL" "$DB" -tAc "select count(*) || ' files, ' || round(sum(size) / 1048576.0) || ' MiB' from evidence where run_id = $RUN or attempt_id = $ATTEMPT or course_id is not null or timing_system_id is not null or entry_id is not null")"

rss() { awk '/VmRSS/ {print $2}' "/proc/$PID/status"; }
BASE=$(rss)
( while kill -0 "$PID" 2>/dev/null; do rss; sleep 0.05; done ) >"$DIR/bench-dossier-rss.log" &
WATCH=$!
OUT=$(curl -s -w ' %{time_total}' -X POST -b "nuxt-session=$TEAM" "$APP/api/attempts/$ATTEMPT/dossiers")
kill $WATCH 2>/dev/null || true
PEAK=$(sort -n "$DIR/bench-dossier-rss.log" | tail -1)
echo "$OUT" | grep -q pdfSha256 || { echo "the dossier was not built: $OUT"; exit 1; }
node -e "
const [t, base, peak, size] = [Number(process.argv[1]), Number(process.argv[2]), Number(process.argv[3]), process.argv[4]]
console.log('dossier build: ' + t.toFixed(2) + ' s, PDF ' + size + ' bytes; app server memory growth ' + ((peak - base) / 1024).toFixed(1) + ' MiB (RSS ' + (base / 1024).toFixed(0) + ' → ' + (peak / 1024).toFixed(0) + ' MiB)')
" "$(echo "$OUT" | awk '{print $NF}')" "$BASE" "$PEAK" "$(echo "$OUT" | grep -o '"pdfSize":[0-9]*' | cut -d: -f2)"
