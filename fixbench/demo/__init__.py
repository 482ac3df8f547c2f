"""The fictional demo shop: its planned history (plan), each case played at the bench by the
engine (bench_play), and the writing of it all through the store's own functions (shop)."""
