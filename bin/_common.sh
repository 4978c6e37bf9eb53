# Shared by bin/start and bin/test: installs what is missing, never more.
ROOT=$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)
cd "$ROOT"
export PATH="$ROOT/node_modules/.bin:$PATH"

port_in_use() { (exec 3<>"/dev/tcp/127.0.0.1/$1") 2>/dev/null; }

free_port() { node -e 'const s=require("net").createServer().listen(0,"127.0.0.1",()=>{console.log(s.address().port);s.close()})'; }

ensure_node_modules() {
  command -v node >/dev/null || { echo "Node.js 20 and npm are needed (see README.md)." >&2; exit 1; }
  if [ ! -f node_modules/.package-lock.json ] || [ package-lock.json -nt node_modules/.package-lock.json ]; then
    echo "Installing npm dependencies (npm ci)..."
    npm ci --no-audit --no-fund --loglevel=error
  fi
}

ensure_debian_package() { # command package
  command -v "$1" >/dev/null 2>&1 && return 0
  if [ "$(id -u)" != 0 ]; then
    echo "$1 is missing. Install it first, e.g.: sudo apt-get install -y $2" >&2
    exit 1
  fi
  echo "Installing $2 from Debian's packages..."
  DEBIAN_FRONTEND=noninteractive apt-get update -qq
  DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$2" >/dev/null
}
