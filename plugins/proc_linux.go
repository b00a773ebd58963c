package plugins

import (
	"bytes"
	"os"
	"os/exec"
	"strconv"
	"syscall"

	"golang.org/x/sys/unix"
)

// sysProcAttr starts a plugin in its own process group, killed when
// pairwell dies (also by SIGKILL).
func sysProcAttr() *syscall.SysProcAttr {
	return &syscall.SysProcAttr{Setpgid: true, Pdeathsig: syscall.SIGKILL}
}

// execPath makes c execute the open file exe (passed as the plugin's
// descriptor 3, so that "#!" scripts work too) and returns its path.
func execPath(exe *os.File, c *exec.Cmd) string {
	c.ExtraFiles = []*os.File{exe}
	return "/proc/self/fd/3"
}

// killGroup kills the process group pgid.
func killGroup(pgid int) { _ = syscall.Kill(-pgid, syscall.SIGKILL) }

// killTree kills the process pid, its process group and every descendant,
// also those in other groups or sessions: the tree is first frozen
// (SIGSTOP, so that nothing forks while it is collected), then killed.
func killTree(pid int) {
	own := syscall.Getpgrp()
	stopped := map[int]bool{}
	for range 20 {
		fresh := false
		for _, q := range descendants(pid) {
			if !stopped[q] {
				stopped[q] = true
				fresh = true
				_ = syscall.Kill(q, syscall.SIGSTOP)
			}
		}
		if !fresh {
			break
		}
	}
	_ = syscall.Kill(pid, syscall.SIGSTOP)
	killGroup(pid)
	for q := range stopped {
		if g, err := syscall.Getpgid(q); err == nil && g != own && g > 1 {
			killGroup(g)
		}
		_ = syscall.Kill(q, syscall.SIGKILL)
	}
	_ = syscall.Kill(pid, syscall.SIGKILL)
}

// descendants lists the processes below pid, read from /proc.
func descendants(pid int) []int {
	entries, err := os.ReadDir("/proc")
	if err != nil {
		return nil
	}
	children := map[int][]int{}
	for _, e := range entries {
		q, err := strconv.Atoi(e.Name())
		if err != nil {
			continue
		}
		if pp, ok := parentOf(q); ok {
			children[pp] = append(children[pp], q)
		}
	}
	var out []int
	queue := []int{pid}
	seen := map[int]bool{pid: true}
	for len(queue) > 0 {
		q := queue[0]
		queue = queue[1:]
		for _, c := range children[q] {
			if !seen[c] {
				seen[c] = true
				out = append(out, c)
				queue = append(queue, c)
			}
		}
	}
	return out
}

// parentOf reads the parent pid of q from /proc/q/stat ("pid (comm) S
// ppid …"; comm may hold spaces and parentheses).
func parentOf(q int) (int, bool) {
	b, err := os.ReadFile("/proc/" + strconv.Itoa(q) + "/stat")
	if err != nil {
		return 0, false
	}
	i := bytes.LastIndexByte(b, ')')
	if i < 0 {
		return 0, false
	}
	f := bytes.Fields(b[i+1:])
	if len(f) < 2 {
		return 0, false
	}
	pp, err := strconv.Atoi(string(f[1]))
	return pp, err == nil
}

// sealedCopy copies src into an anonymous memory file, sealed against
// writes, and returns it positioned at 0: the bytes hashed are the bytes
// executed, whatever happens to the file at src afterwards.
func sealedCopy(name string) (*os.File, error) {
	fd, err := unix.MemfdCreate(name, unix.MFD_CLOEXEC|unix.MFD_ALLOW_SEALING)
	if err != nil {
		return nil, err
	}
	return os.NewFile(uintptr(fd), "memfd:"+name), nil
}

// seal forbids any further change of the memory file f.
func seal(f *os.File) error {
	_, err := unix.FcntlInt(f.Fd(), unix.F_ADD_SEALS, unix.F_SEAL_SEAL|unix.F_SEAL_SHRINK|unix.F_SEAL_GROW|unix.F_SEAL_WRITE)
	return err
}
