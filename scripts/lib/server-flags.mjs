// Node flags of the API server process, shared by `npm start` and `npm run bench` (which runs the
// app in its own process and must run it as production does).
//
// A 128 MB semi-space for V8's young generation (the default is 16 MB): a /fit answer allocates
// about 650 kB of short-lived objects (the request checked, the fit, the JSON), so with 50 requests
// in flight a small young generation is scavenged while most of them are still being answered, and
// their requests and responses are promoted to the old generation, to be marked and swept later.
// Measured with `npm run bench -- http` (64 screens per route) on the 2-core machine: per /fit
// answer about 100 kB promoted at 64 MB, 16 kB at 128 MB (the bare route: 13 kB), and server CPU
// 1 300–1 330 µs against 1 490–1 580 µs; 256 MB changed nothing more. Earlier, 64 MB against the
// default: 965–1 227 µs against 1 406–1 572 µs. The space is reserved, and committed as it fills:
// a busy server's young generation can hold a few hundred MB.
export const SERVER_NODE_FLAGS = ['--max-semi-space-size=128'];
