// Package pluginpb is the Go code generated from pairwell.proto, the pairwell
// plugin protocol. Authors of plugins in Go use package plugins/sdk instead;
// authors in other languages implement pairwell.proto directly.
//
// Regenerate after editing pairwell.proto (Debian: apt-get install
// protobuf-compiler; then go install
// google.golang.org/protobuf/cmd/protoc-gen-go@v1.36.12 and
// google.golang.org/grpc/cmd/protoc-gen-go-grpc@v1.6.2, with $(go env
// GOPATH)/bin on PATH) by running go generate in this directory.
package pluginpb

//go:generate protoc --proto_path=. --go_out=. --go_opt=paths=source_relative --go-grpc_out=. --go-grpc_opt=paths=source_relative pairwell.proto
