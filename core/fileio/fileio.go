// Package fileio is pairwell's one policy for the files a run reads and
// writes.
//
// Reading: ReadFile reads a regular file with a size cap, so that a FIFO,
// a device such as /dev/zero or a huge file cannot make a run read forever
// or exhaust memory, and records the file as an input of the run.
//
// Writing: WriteFile replaces a file atomically — readers see the old
// content or the complete new one — and never destroys anything else:
//
//   - a target that is an input of the same run (the same device and
//     inode, whatever its name: a hard link is caught too) is refused;
//   - a target that is a symbolic link is refused (neither followed nor
//     replaced: name the file itself);
//   - a target that is a directory, a device, a FIFO or a socket is
//     refused, and so is "-" (standard output carries the report);
//   - a file being replaced keeps its permission bits; a new file gets
//     0666 less the umask;
//   - the new content goes to a temporary file in the target's directory
//     that is renamed over the target once complete and synced. On Linux
//     it is an unnamed O_TMPFILE file, which vanishes with the process
//     whichever way it ends (even SIGKILL) and is given a name only for the
//     instant of the rename; elsewhere it is a hidden ".NAME.*.tmp" file
//     removed on every error and, through Run.RemoveTemps, on a signal.
//
// Refusals wrap ErrRefused; the caller treats them as bad input.
package fileio

import (
	"bufio"
	"crypto/rand"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sync"
	"syscall"
)

// ErrRefused means a target may not be written, or an input not read,
// under the policy of the package documentation.
var ErrRefused = errors.New("refused")

// ErrTooLarge means an input file is larger than its cap.
var ErrTooLarge = errors.New("file too large")

// fileID identifies a file independently of its name.
type fileID struct{ dev, ino uint64 }

func idOf(st fs.FileInfo) (fileID, bool) {
	s, ok := st.Sys().(*syscall.Stat_t)
	if !ok {
		return fileID{}, false
	}
	return fileID{dev: uint64(s.Dev), ino: uint64(s.Ino)}, true
}

// Run is the file access of one run: the inputs it read, which no output
// may replace, and the named temporary files in flight. The zero value is
// ready to use; a nil *Run knows no inputs and tracks no temporary files.
// It is safe for concurrent use.
type Run struct {
	mu     sync.Mutex
	inputs map[fileID]string
	temps  map[string]bool

	named bool // tests: always use a named temporary file
}

// Input records the file at path (symbolic links followed) as an input of
// the run. A path that does not exist is ignored.
func (r *Run) Input(path string) {
	if r == nil {
		return
	}
	if st, err := os.Stat(path); err == nil {
		r.addInput(st, path)
	}
}

func (r *Run) addInput(st fs.FileInfo, path string) {
	id, ok := idOf(st)
	if !ok {
		return
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	if r.inputs == nil {
		r.inputs = make(map[fileID]string)
	}
	if _, dup := r.inputs[id]; !dup {
		r.inputs[id] = path
	}
}

// inputName returns the name under which the file st was read, if it is
// an input.
func (r *Run) inputName(st fs.FileInfo) (string, bool) {
	if r == nil {
		return "", false
	}
	id, ok := idOf(st)
	if !ok {
		return "", false
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	name, found := r.inputs[id]
	return name, found
}

// ReadFile reads the regular file at path, at most max bytes (max > 0),
// and records it as an input. A FIFO, device, directory or socket is
// refused (ErrRefused), a longer file is ErrTooLarge; neither is read.
func (r *Run) ReadFile(path string, max int64) ([]byte, error) {
	// O_NONBLOCK: opening a FIFO must not wait for a writer; it is then
	// refused as not regular.
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if !st.Mode().IsRegular() {
		return nil, fmt.Errorf("%s: %w: %s, not a regular file", path, ErrRefused, kind(st.Mode()))
	}
	if st.Size() > max {
		return nil, fmt.Errorf("%s: %w: %d bytes, the limit is %d", path, ErrTooLarge, st.Size(), max)
	}
	if r != nil {
		r.addInput(st, path)
	}
	data, err := io.ReadAll(io.LimitReader(f, max+1))
	if err != nil {
		return nil, err
	}
	if int64(len(data)) > max { // it grew while being read
		return nil, fmt.Errorf("%s: %w: more than %d bytes", path, ErrTooLarge, max)
	}
	return data, nil
}

// kind names a file mode for error messages.
func kind(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a directory"
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	case m&fs.ModeNamedPipe != 0:
		return "a FIFO"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeDevice != 0:
		return "a device"
	}
	return "not a regular file"
}

// Check reports whether path may be written under the policy, without
// writing: a command calls it before its work starts, so that a refused
// target costs nothing. It returns the mode the written file will have
// (0 for a new file: 0666 less the umask).
func (r *Run) Check(path string) (fs.FileMode, error) {
	if path == "-" {
		return 0, fmt.Errorf("%q: %w: writing to standard output is not supported here (it carries the report); name a file", path, ErrRefused)
	}
	if path == "" {
		return 0, fmt.Errorf("%w: empty file name", ErrRefused)
	}
	st, err := os.Lstat(path)
	if errors.Is(err, fs.ErrNotExist) {
		return 0, nil
	}
	if err != nil {
		return 0, err
	}
	switch m := st.Mode(); {
	case m&fs.ModeSymlink != 0:
		return 0, fmt.Errorf("%s: %w: it is a symbolic link, which pairwell neither follows nor replaces; name the file itself", path, ErrRefused)
	case !m.IsRegular():
		return 0, fmt.Errorf("%s: %w: it is %s, not a regular file; pairwell replaces only regular files", path, ErrRefused, kind(m))
	}
	if name, ok := r.inputName(st); ok {
		if name == path {
			return 0, fmt.Errorf("%s: %w: it is an input of this run; writing it would destroy it", path, ErrRefused)
		}
		return 0, fmt.Errorf("%s: %w: it is the same file as the input %s; writing it would destroy it", path, ErrRefused, name)
	}
	return st.Mode().Perm(), nil
}

// WriteFile writes what write produces to path under the policy of the
// package documentation: checked, then written to a temporary file in the
// same directory, synced, and renamed over path. On any error path is left
// as it was and no temporary file remains.
func (r *Run) WriteFile(path string, write func(w io.Writer) error) (err error) {
	mode, err := r.Check(path)
	if err != nil {
		return err
	}
	dir := filepath.Dir(path)
	tmp, err := r.create(dir, filepath.Base(path), mode)
	if err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			err = pe.Err
		}
		return fmt.Errorf("writing %s: cannot create a file in %s: %w", path, dir, err)
	}
	defer func() {
		if err != nil {
			tmp.discard()
		}
	}()
	bw := bufio.NewWriter(tmp.f)
	if err := write(bw); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if mode != 0 {
		// Keep the mode of the file being replaced (creation applied
		// the umask to it).
		if err := tmp.f.Chmod(mode); err != nil {
			return fmt.Errorf("writing %s: %w", path, err)
		}
	}
	if err := tmp.f.Sync(); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	// The target may have changed while we wrote: check again.
	if _, err := r.Check(path); err != nil {
		return err
	}
	if err := tmp.commit(path); err != nil {
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return nil
}

// ReadFile reads a regular file of at most max bytes, as Run.ReadFile does,
// for library callers that keep no run.
func ReadFile(path string, max int64) ([]byte, error) {
	return (*Run)(nil).ReadFile(path, max)
}

// WriteFile writes to path under the policy without a run's inputs: for
// library callers that know of none.
func WriteFile(path string, write func(w io.Writer) error) error {
	return (*Run)(nil).WriteFile(path, write)
}

// RemoveTemps removes the named temporary files in flight; the CLI calls
// it on a signal, just before it dies.
func (r *Run) RemoveTemps() {
	if r == nil {
		return
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	for name := range r.temps {
		os.Remove(name)
		delete(r.temps, name)
	}
}

func (r *Run) track(name string) {
	if r == nil {
		return
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	if r.temps == nil {
		r.temps = make(map[string]bool)
	}
	r.temps[name] = true
}

func (r *Run) untrack(name string) {
	if r == nil {
		return
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	delete(r.temps, name)
}

// temp is a temporary file on its way to become the target.
type temp struct {
	r    *Run
	f    *os.File
	dir  string
	base string
	name string // "" while it is unnamed (O_TMPFILE)
}

// create makes the temporary file: unnamed where the system can, else a
// hidden file next to the target.
func (r *Run) create(dir, base string, mode fs.FileMode) (*temp, error) {
	perm := fs.FileMode(0o666)
	if mode != 0 {
		perm = mode
	}
	if r == nil || !r.named {
		if f, err := openUnnamed(dir, perm); err == nil {
			return &temp{r: r, f: f, dir: dir, base: base}, nil
		}
	}
	for range 100 {
		name := tempName(dir, base)
		r.track(name)
		f, err := os.OpenFile(name, os.O_WRONLY|os.O_CREATE|os.O_EXCL, perm)
		if errors.Is(err, fs.ErrExist) {
			r.untrack(name)
			continue
		}
		if err != nil {
			r.untrack(name)
			return nil, err
		}
		return &temp{r: r, f: f, dir: dir, base: base, name: name}, nil
	}
	return nil, errors.New("no free temporary name")
}

func tempName(dir, base string) string {
	var b [6]byte
	_, _ = rand.Read(b[:])
	return filepath.Join(dir, "."+base+"."+hex.EncodeToString(b[:])+".tmp")
}

// commit gives the file its final name.
func (t *temp) commit(path string) error {
	if t.name == "" {
		for range 100 {
			name := tempName(t.dir, t.base)
			t.r.track(name)
			err := linkUnnamed(t.f, name)
			if errors.Is(err, fs.ErrExist) {
				t.r.untrack(name)
				continue
			}
			if err != nil {
				t.r.untrack(name)
				return err
			}
			t.name = name
			break
		}
		if t.name == "" {
			return errors.New("no free temporary name")
		}
	}
	if err := t.f.Close(); err != nil {
		return err
	}
	if err := os.Rename(t.name, path); err != nil {
		return err
	}
	t.r.untrack(t.name)
	return nil
}

// discard closes and removes the temporary file.
func (t *temp) discard() {
	t.f.Close()
	if t.name != "" {
		os.Remove(t.name)
		t.r.untrack(t.name)
	}
}
