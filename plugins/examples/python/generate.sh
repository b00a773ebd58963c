#!/bin/sh
# Regenerates the Python protocol code of the example plugin from
# plugins/proto/pairwell.proto and the two go-plugin services in proto/.
# Needs Debian's protobuf-compiler and protobuf-compiler-grpc (protoc 3.21
# and grpc_python_plugin 1.51, matching python3-protobuf and python3-grpcio
# of Debian 12):
#
#   apt-get install -y protobuf-compiler protobuf-compiler-grpc
#   sh plugins/examples/python/generate.sh
set -eu
here=$(cd "$(dirname "$0")" && pwd)
plugin=$(command -v grpc_python_plugin)
cd "$here"
protoc -I ../../proto -I proto \
  --python_out=. --grpc_python_out=. --plugin=protoc-gen-grpc_python="$plugin" \
  pairwell.proto health.proto controller.proto
