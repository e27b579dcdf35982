#!/usr/bin/env bash
# Renders nginx.conf.template into a run folder for the Strandline front, sized from the arguments
# the service runs with (its --max-body-mb, --threads and --max-concurrent), and checks it with
# `nginx -t`. Used by serve_behind_proxy.sh and by the strandline-front systemd unit.
set -euo pipefail
here="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"

usage="usage: render_nginx_conf.sh --run-dir DIR --port P [--host H] --upstream HOST:PORT
         [--tls-cert FILE --tls-key FILE] [--conn-per-ip N] [--rate-per-ip N]
         [--access-log PATH|off] [--template FILE] [-- <strandline serve arguments>]"
die_usage() { echo "render_nginx_conf.sh: $*" >&2; echo "$usage" >&2; exit 2; }
is_count() { [[ $1 =~ ^[0-9]+$ ]] && (( 10#$1 >= 1 && 10#$1 <= 1000000 )); }

run_dir= port= host=0.0.0.0 upstream= tls_cert= tls_key= conn_per_ip=32 rate_per_ip=50
access_log=/dev/stdout template=$here/nginx.conf.template
while (($#)); do
  case $1 in
    --run-dir|--port|--host|--upstream|--tls-cert|--tls-key|--conn-per-ip|--rate-per-ip|--access-log|--template)
      (($# >= 2)) || die_usage "option $1 needs a value"
      name=${1#--}; name=${name//-/_}; printf -v "$name" '%s' "$2"; shift 2 ;;
    --) shift; break ;;
    -h|--help) echo "$usage"; exit 0 ;;
    *) die_usage "unknown argument \"$1\"" ;;
  esac
done
serve_args=("$@")

[[ -n $run_dir ]] || die_usage "--run-dir is required"
[[ $port =~ ^[0-9]+$ ]] && (( 10#$port >= 1 && 10#$port <= 65535 )) || die_usage "--port: expected 1..65535, got \"$port\""
address_re='^[][0-9A-Za-z.:*-]+$' upstream_re='^[][0-9A-Za-z.:-]+:[0-9]+$'
[[ $upstream =~ $upstream_re ]] || die_usage "--upstream: expected HOST:PORT, got \"$upstream\""
[[ $host =~ $address_re ]] || die_usage "--host: not an address: \"$host\""
is_count "$conn_per_ip" || die_usage "--conn-per-ip: expected a positive integer, got \"$conn_per_ip\""
is_count "$rate_per_ip" || die_usage "--rate-per-ip: expected a positive integer, got \"$rate_per_ip\""
[[ -z $tls_cert && -z $tls_key || -n $tls_cert && -n $tls_key ]] || die_usage "--tls-cert and --tls-key go together"
for f in "$tls_cert" "$tls_key"; do
  [[ -z $f || -r $f ]] || die_usage "cannot read $f"
done
[[ -r $template ]] || die_usage "cannot read the template $template"

# The service's own limits, as `strandline serve` reads them (defaults from `serve --help`).
max_body_mb=512 threads=96 max_concurrent=80
for ((i = 0; i < ${#serve_args[@]}; i++)); do
  arg=${serve_args[i]} value=
  case $arg in
    --max-body-mb=*|--threads=*|--max-concurrent=*) value=${arg#*=}; arg=${arg%%=*} ;;
    --max-body-mb|--threads|--max-concurrent) value=${serve_args[i + 1]:-} ; i=$((i + 1)) ;;
    *) continue ;;
  esac
  is_count "$value" || die_usage "serve option $arg: expected a positive integer, got \"$value\""
  case $arg in
    --max-body-mb) max_body_mb=$((10#$value)) ;;
    --threads) threads=$((10#$value)) ;;
    --max-concurrent) max_concurrent=$((10#$value)) ;;
  esac
done

# Every connection nginx holds to the service takes one of its threads: the requests in progress
# plus the idle keep-alive connections (per worker). Requests passed at once stay within both the
# service's --max-concurrent and what is left of --threads, so its pool never queues.
workers=2 keepalive=8
service_conns=$(( threads - workers * keepalive ))
(( service_conns > max_concurrent )) && service_conns=$max_concurrent
(( service_conns >= 1 )) || die_usage "serve --threads $threads leaves no thread beside the front's $((workers * keepalive)) keep-alive connections"

listen="$host:$port"
[[ $host == *:* && $host != \[* ]] && listen="[$host]:$port"
[[ -n $tls_cert ]] && listen+=" ssl"
case $access_log in
  off) access_log_line=off ;;
  *) access_log_line="$access_log front" ;;
esac
# A master started as root drops its workers to nobody; otherwise they run as the caller.
user_line="# workers run as the user who starts nginx"
if (( EUID == 0 )); then user_line="user nobody nogroup;"; fi

mkdir -p "$run_dir"
run_dir=$(cd "$run_dir" && pwd)
[[ $run_dir =~ ^[A-Za-z0-9_./-]+$ ]] || die_usage "--run-dir: use a path of letters, digits and ._-/ only: $run_dir"
[[ -z $tls_cert ]] || tls_cert=$(realpath "$tls_cert")
[[ -z $tls_key ]] || tls_key=$(realpath "$tls_key")
# The workers (nobody, when started as root) must reach the temp folders nginx creates here.
(( EUID == 0 )) && chmod 711 "$run_dir"

sed_escape() { printf '%s' "$1" | sed 's/[\\&|]/\\&/g'; }
tls_filter='/^#tls# /d'
[[ -n $tls_cert ]] && tls_filter='s/^#tls# //'
sed -e "$tls_filter" \
    -e "s|@USER_LINE@|$(sed_escape "$user_line")|g" \
    -e "s|@WORKERS@|$workers|g" \
    -e "s|@RUN_DIR@|$(sed_escape "$run_dir")|g" \
    -e "s|@ACCESS_LOG@|$(sed_escape "$access_log_line")|g" \
    -e "s|@CLIENT_TIMEOUT_S@|10|g" \
    -e "s|@UPSTREAM_TIMEOUT_S@|600|g" \
    -e "s|@MAX_BODY_MB@|$max_body_mb|g" \
    -e "s|@RATE_PER_IP@|$rate_per_ip|g" \
    -e "s|@BURST_PER_IP@|$((rate_per_ip * 2))|g" \
    -e "s|@CONN_PER_IP@|$conn_per_ip|g" \
    -e "s|@SERVICE_CONNS@|$service_conns|g" \
    -e "s|@KEEPALIVE@|$keepalive|g" \
    -e "s|@UPSTREAM@|$upstream|g" \
    -e "s|@LISTEN@|$(sed_escape "$listen")|g" \
    -e "s|@TLS_CERT@|$(sed_escape "$tls_cert")|g" \
    -e "s|@TLS_KEY@|$(sed_escape "$tls_key")|g" \
    "$template" > "$run_dir/nginx.conf.new"
if grep -n '@[A-Z][A-Z_]*@' "$run_dir/nginx.conf.new" >&2; then
  echo "render_nginx_conf.sh: placeholders left in the rendered configuration (above)" >&2
  exit 1
fi
mv "$run_dir/nginx.conf.new" "$run_dir/nginx.conf"
nginx=$(command -v nginx || echo /usr/sbin/nginx)
if ! out=$("$nginx" -t -q -p "$run_dir" -c "$run_dir/nginx.conf" -e stderr 2>&1); then
  echo "render_nginx_conf.sh: nginx refuses $run_dir/nginx.conf:" >&2
  echo "$out" >&2
  exit 1
fi
echo "$run_dir/nginx.conf"
