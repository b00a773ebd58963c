package plugins

import (
	"bufio"
	"bytes"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/pairwell/pairwell/core/fileio"
)

// ErrRef means a plugin reference, a plugin path list or a lock file is
// malformed.
var ErrRef = errors.New("invalid plugin reference")

// Prefix is the name prefix of the executables Discover finds.
const Prefix = "pairwell-plugin-"

// Ref names a plugin executable and optionally pins its SHA-256.
type Ref struct {
	Path   string
	SHA256 []byte // nil: not pinned
}

// String formats r as ParseRef reads it.
func (r Ref) String() string {
	if r.SHA256 == nil {
		return r.Path
	}
	return r.Path + "@sha256:" + hex.EncodeToString(r.SHA256)
}

// ParseRef parses PATH or PATH@sha256:HEX, HEX being the 64 hexadecimal
// digits of the executable's SHA-256 digest (as printed by sha256sum).
func ParseRef(s string) (Ref, error) {
	path, sum, pinned := cutLast(s, "@sha256:")
	if strings.TrimSpace(path) == "" {
		return Ref{}, fmt.Errorf("%w %q: empty path; expected PATH or PATH@sha256:HEX", ErrRef, s)
	}
	if !pinned {
		return Ref{Path: path}, nil
	}
	b, err := parseSum(sum)
	if err != nil {
		return Ref{}, fmt.Errorf("%w %q: %v", ErrRef, s, err)
	}
	return Ref{Path: path, SHA256: b}, nil
}

func cutLast(s, sep string) (before, after string, found bool) {
	i := strings.LastIndex(s, sep)
	if i < 0 {
		return s, "", false
	}
	return s[:i], s[i+len(sep):], true
}

func parseSum(s string) ([]byte, error) {
	b, err := hex.DecodeString(strings.TrimSpace(s))
	if err != nil || len(b) != 32 {
		return nil, fmt.Errorf("%q is not a SHA-256 digest (64 hexadecimal digits)", s)
	}
	return b, nil
}

// Discover returns the plugins in the directories of list, separated by
// os.PathListSeparator (':' on Unix) like PATH: every executable regular
// file (or symbolic link to one) whose name starts with Prefix, directory
// by directory in list order and by name within a directory. Empty entries
// and missing directories are skipped; an unreadable directory is an error.
//
// Only directories nobody else can write to are trusted: a relative entry
// (such as "." — it would depend on where pairwell is run), and a
// directory or plugin that others may write to (see Untrusted), are errors
// wrapping ErrUntrusted. Symbolic links are followed, and the checks apply
// to what they lead to.
func Discover(list string) ([]string, error) {
	var found []string
	for _, dir := range filepath.SplitList(list) {
		if dir == "" {
			continue
		}
		if !filepath.IsAbs(dir) {
			return nil, fmt.Errorf("plugin directory %q: %w: it is relative, so what it holds depends on where pairwell runs; give an absolute path", dir, ErrUntrusted)
		}
		entries, err := os.ReadDir(dir)
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return nil, fmt.Errorf("plugin directory %s: %w", dir, err)
		}
		if err := untrustedDir(dir); err != nil {
			return nil, fmt.Errorf("plugin directory %s: %w", dir, err)
		}
		var names []string
		for _, e := range entries {
			if !strings.HasPrefix(e.Name(), Prefix) {
				continue
			}
			path := filepath.Join(dir, e.Name())
			st, err := os.Stat(path)
			if err != nil || !st.Mode().IsRegular() || st.Mode().Perm()&0o111 == 0 {
				continue
			}
			if err := Untrusted(path); err != nil {
				return nil, err
			}
			names = append(names, e.Name())
		}
		sort.Strings(names)
		for _, n := range names {
			found = append(found, filepath.Join(dir, n))
		}
	}
	return found, nil
}

// ErrUntrusted means a plugin, or a directory it is found in, could be
// replaced by other users.
var ErrUntrusted = errors.New("not trusted")

// Untrusted returns an error wrapping ErrUntrusted if other users could
// replace the plugin executable at path: if the file (symbolic links
// resolved) is writable by others, or the directory of path or of the file
// it leads to, or any directory above them, is writable by others — unless that directory has the sticky bit (as /tmp
// does) and is not the plugin's own directory. It returns nil for a file
// it cannot inspect (Load reports those).
func Untrusted(path string) error {
	real, err := filepath.EvalSymlinks(path)
	if err != nil {
		return nil
	}
	st, err := os.Stat(real)
	if err != nil {
		return nil
	}
	if st.Mode().Perm()&0o002 != 0 {
		return fmt.Errorf("plugin %s: %w: the file is writable by everyone (mode %v)", path, ErrUntrusted, st.Mode().Perm())
	}
	// The directory of the name given (a link there can be replaced) and
	// that of the file it leads to.
	for _, d := range []string{filepath.Dir(path), filepath.Dir(real)} {
		if err := untrustedDir(d); err != nil {
			return fmt.Errorf("plugin %s: %w", path, err)
		}
	}
	return nil
}

// untrustedDir checks dir (symbolic links resolved) and the directories
// above it.
func untrustedDir(dir string) error {
	real, err := filepath.EvalSymlinks(dir)
	if err != nil {
		return nil
	}
	for d, own := real, true; ; d, own = filepath.Dir(d), false {
		st, err := os.Stat(d)
		if err == nil && st.Mode().Perm()&0o002 != 0 && (own || st.Mode()&fs.ModeSticky == 0) {
			return fmt.Errorf("%w: %s is writable by everyone (mode %v), so anyone could put a plugin there", ErrUntrusted, d, st.Mode()&(fs.ModePerm|fs.ModeSticky))
		}
		if parent := filepath.Dir(d); parent == d {
			return nil
		}
	}
}

// MaxLockSize is the largest lock file ReadLock reads, in bytes.
const MaxLockSize = 1 << 20

// Lock pins plugins to their SHA-256 digests, by absolute path.
type Lock map[string][]byte

// ReadLock reads a lock file (a regular file of at most MaxLockSize bytes)
// in the format sha256sum prints: one
// "HEX  PATH" line per plugin (a '*' before PATH is allowed). A relative
// PATH is relative to the lock file's directory. Blank lines and lines
// starting with '#' are ignored.
func ReadLock(path string) (Lock, error) {
	data, err := fileio.ReadFile(path, MaxLockSize)
	if err != nil {
		return nil, fmt.Errorf("plugin lock file: %w", err)
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, fmt.Errorf("plugin lock file: %w", err)
	}
	l, err := ParseLock(bytes.NewReader(data), filepath.Dir(abs))
	if err != nil {
		return nil, fmt.Errorf("plugin lock file %s: %w", path, err)
	}
	return l, nil
}

// ParseLock reads lock lines from r, resolving relative paths against dir.
func ParseLock(r io.Reader, dir string) (Lock, error) {
	l := make(Lock)
	sc := bufio.NewScanner(r)
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		sum, path, ok := strings.Cut(line, " ")
		path = strings.TrimPrefix(strings.TrimSpace(path), "*")
		if !ok || path == "" {
			return nil, fmt.Errorf("%w: line %d: expected \"HEX  PATH\"", ErrRef, n)
		}
		b, err := parseSum(sum)
		if err != nil {
			return nil, fmt.Errorf("%w: line %d: %v", ErrRef, n, err)
		}
		if !filepath.IsAbs(path) {
			path = filepath.Join(dir, path)
		}
		l[filepath.Clean(path)] = b
	}
	if err := sc.Err(); err != nil {
		return nil, err
	}
	return l, nil
}

// Lookup returns the pinned digest of the plugin at path, compared as an
// absolute path and, failing that, with symbolic links resolved.
func (l Lock) Lookup(path string) ([]byte, bool) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return nil, false
	}
	if b, ok := l[abs]; ok {
		return b, true
	}
	real, err := filepath.EvalSymlinks(abs)
	if err != nil {
		return nil, false
	}
	for p, b := range l {
		if q, err := filepath.EvalSymlinks(p); err == nil && q == real {
			return b, true
		}
	}
	return nil, false
}
