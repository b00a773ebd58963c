//go:build !linux

package fileio

import (
	"errors"
	"io/fs"
	"os"
)

var errNoUnnamed = errors.New("unnamed temporary files are not supported here")

func openUnnamed(string, fs.FileMode) (*os.File, error) { return nil, errNoUnnamed }

func linkUnnamed(*os.File, string) error { return errNoUnnamed }
