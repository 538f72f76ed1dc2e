// Node flags of the API server process, shared by `npm start` and `npm run bench` (which runs the
// app in its own process and must run it as production does).
//
// A 64 MB semi-space for V8's young generation (the default is 16 MB): a calculator answer
// allocates a few hundred kB of short-lived objects, and with 50 requests in flight a small young
// generation is scavenged so often that in-flight answers survive into the old generation and cost
// a full collection later. Measured with `npm run bench -- http` on the 2-core machine: server CPU
// per /fit answer 1 227–965 µs against 1 406–1 572 µs at the default (and less for the bare route
// too). The space is reserved, and committed only as it fills.
export const SERVER_NODE_FLAGS = ['--max-semi-space-size=64'];
