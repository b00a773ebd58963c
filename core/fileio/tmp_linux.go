package fileio

import (
	"io/fs"
	"os"
	"strconv"

	"golang.org/x/sys/unix"
)

// openUnnamed opens an unnamed file in dir (O_TMPFILE): it is never seen
// under a name and vanishes with the process unless linkUnnamed names it.
func openUnnamed(dir string, perm fs.FileMode) (*os.File, error) {
	fd, err := unix.Open(dir, unix.O_TMPFILE|unix.O_WRONLY|unix.O_CLOEXEC, uint32(perm.Perm()))
	if err != nil {
		return nil, err
	}
	return os.NewFile(uintptr(fd), dir), nil
}

// linkUnnamed gives the unnamed file f the name name (which must not
// exist).
func linkUnnamed(f *os.File, name string) error {
	err := unix.Linkat(unix.AT_FDCWD, "/proc/self/fd/"+strconv.Itoa(int(f.Fd())), unix.AT_FDCWD, name, unix.AT_SYMLINK_FOLLOW)
	if err != nil {
		return &fs.PathError{Op: "link", Path: name, Err: err}
	}
	return nil
}
