package fmo

import "sync"

// onceMap memoises f(key) for concurrent callers: the first caller of a key computes it,
// later callers of that key wait for and share the value. With a positive limit the map is
// emptied when it holds that many keys, so memory stays bounded over a long screen (values
// already handed out stay valid). The zero value is ready.
type onceMap[K comparable, V any] struct {
	mu sync.Mutex
	m  map[K]*onceEntry[V]
}

type onceEntry[V any] struct {
	once sync.Once
	v    V
}

// get returns the value for k, computing it with f on first use.
func (c *onceMap[K, V]) get(k K, limit int, f func() V) *V {
	c.mu.Lock()
	if c.m == nil || (limit > 0 && len(c.m) >= limit) {
		c.m = make(map[K]*onceEntry[V])
	}
	e := c.m[k]
	if e == nil {
		e = &onceEntry[V]{}
		c.m[k] = e
	}
	c.mu.Unlock()
	e.once.Do(func() { e.v = f() })
	return &e.v
}
