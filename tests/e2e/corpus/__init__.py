"""Data and page drivers for the bad-input corpus and the security tests (tests/e2e)."""
