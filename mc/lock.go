package mc

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"time"
)

// LockFile is the lock of a run directory. Whoever writes or resumes a run
// holds an exclusive flock(2) on it for the whole run; the kernel releases
// it when the process ends, however it ends, so a crashed run never leaves
// a stale lock. The holder writes its pid, host and start time into the
// file, so that a refused writer can say who holds the directory (on a
// shared cluster file system the host matters). Linux maps flock onto NFS
// byte-range locks, so the lock holds across hosts on NFS as well.
const LockFile = "lock"

// heldLocks are the run directories this process holds, by absolute path:
// a command may lock a directory for its whole run and the Store of that
// run lock it again (flock locks of one process on two descriptors of one
// file would exclude each other, so the second lock is counted instead).
var heldLocks = struct {
	sync.Mutex
	m map[string]*dirLock
}{m: map[string]*dirLock{}}

type dirLock struct {
	f    *os.File
	refs int
}

// LockDir takes the exclusive lock of the run directory dir, creating dir
// if it is missing, and returns the function that releases it. A
// directory another process holds is refused with an error naming that
// process's pid and host. Nothing but the lock file is written before the
// lock is won.
func LockDir(dir string) (unlock func() error, err error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("run directory %s: %w", dir, unwrapPathError(err))
	}
	key, err := filepath.Abs(dir)
	if err != nil {
		return nil, err
	}
	if r, err := filepath.EvalSymlinks(key); err == nil {
		key = r
	}
	heldLocks.Lock()
	defer heldLocks.Unlock()
	if l := heldLocks.m[key]; l != nil {
		l.refs++
		return releaser(key), nil
	}
	path := filepath.Join(dir, LockFile)
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE|syscall.O_NOFOLLOW|syscall.O_NONBLOCK, 0o644)
	if err != nil {
		return nil, fmt.Errorf("cannot lock run directory %s: %w", dir, unwrapPathError(err))
	}
	if fi, err := f.Stat(); err != nil || !fi.Mode().IsRegular() {
		f.Close()
		return nil, fmt.Errorf("cannot lock run directory %s: %s is not a regular file", dir, path)
	}
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
		holder := readHolder(f)
		f.Close()
		if errors.Is(err, syscall.EWOULDBLOCK) {
			return nil, fmt.Errorf("run directory %s is in use by another rampart (%s): wait for it to finish, or choose another directory", dir, holder)
		}
		return nil, fmt.Errorf("cannot lock run directory %s: %w", dir, err)
	}
	host, _ := os.Hostname()
	if host == "" {
		host = "unknown host"
	}
	info := fmt.Sprintf("pid %d on host %s since %s\n", os.Getpid(), host, time.Now().UTC().Format(time.RFC3339))
	if err := f.Truncate(0); err == nil {
		f.WriteAt([]byte(info), 0)
	}
	heldLocks.m[key] = &dirLock{f: f, refs: 1}
	return releaser(key), nil
}

func releaser(key string) func() error {
	var once sync.Once
	return func() (err error) {
		once.Do(func() {
			heldLocks.Lock()
			defer heldLocks.Unlock()
			l := heldLocks.m[key]
			if l == nil {
				return
			}
			if l.refs--; l.refs == 0 {
				delete(heldLocks.m, key)
				err = l.f.Close() // closing the last descriptor releases the flock
			}
		})
		return err
	}
}

// readHolder returns what the holder of a lock wrote about itself.
func readHolder(f *os.File) string {
	b := make([]byte, 256)
	n, _ := f.ReadAt(b, 0)
	s := strings.TrimSpace(string(b[:n]))
	if s == "" || strings.ContainsAny(s, "\n\r") {
		return "a process that has not yet said who it is"
	}
	return s
}

// checkNotWriting returns an error if another process holds the lock of dir
// (a run still being written); a directory without a lock file is fine.
func checkNotWriting(dir string) error {
	f, err := os.OpenFile(filepath.Join(dir, LockFile), os.O_RDONLY|syscall.O_NOFOLLOW|syscall.O_NONBLOCK, 0)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return fmt.Errorf("%s: %w", dir, unwrapPathError(err))
	}
	defer f.Close()
	heldLocks.Lock()
	for _, l := range heldLocks.m {
		if os.SameFile(stat(l.f), stat(f)) {
			heldLocks.Unlock()
			return nil // this process holds it
		}
	}
	heldLocks.Unlock()
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_SH|syscall.LOCK_NB); err != nil {
		return fmt.Errorf("%s is still being written by another rampart (%s): wait for it to finish", dir, readHolder(f))
	}
	return nil // closing f releases the shared lock
}

func stat(f *os.File) fs.FileInfo {
	fi, _ := f.Stat()
	return fi
}

// unwrapPathError drops the operation and path of an fs.PathError, which
// the messages here name themselves.
func unwrapPathError(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
