"""The plugin side of pairwell's plugin protocol (version 2), in Python.

pairwell talks to its plugins with HashiCorp go-plugin over gRPC. A plugin
written in a language other than Go implements, besides the Forms service
of plugins/proto/pairwell.proto, the few parts of go-plugin the host relies
on. This module does all of it for forms written in Python; linnett.py is
a complete plugin built on it. What it implements, step by step:

1. The cookie. pairwell starts a plugin with PAIRWELL_PLUGIN set to
   COOKIE_VALUE. Without it the executable was run by hand: it says what it
   is and exits with status 1.
2. The socket. go-plugin's host names a private directory in
   PLUGIN_UNIX_SOCKET_DIR; the plugin listens on a Unix socket there (on
   127.0.0.1 over TCP, port from PLUGIN_MIN_PORT to PLUGIN_MAX_PORT, when the
   variable is unset) and serves plaintext gRPC.
3. The services. Forms (pairwell.plugin.v1), gRPC's health service
   (grpc.health.v1.Health/Check, answering SERVING for the service "plugin",
   which go-plugin asks for) and go-plugin's controller
   (plugin.GRPCController/Shutdown, so that a graceful close ends the
   process). go-plugin's stdio and broker services are optional: the host
   gets UNIMPLEMENTED and does without them.
4. The handshake line, once the server listens, on stdout:
   "1|2|unix|/path/to/socket|grpc|" (go-plugin's core protocol 1, pairwell's
   protocol 2, network, address, gRPC, no certificate). A plugin always
   answers with the version it was written for; pairwell refuses another one
   with a message naming both.
5. The end. pairwell kills the plugin when it is done (SIGKILL); the plugin
   also ends on Shutdown, SIGTERM, SIGINT, SIGHUP, and when its parent
   process is gone (checked every half second), so it never outlives the
   host.

DescribeResponse.fast_path stays empty: the direct evaluation channel of Go
plugins is an optimisation, and pairwell evaluates plugins without one over
gRPC's Evaluate.

A form is any object with the attributes and methods of Form below: its
metadata (key, name, formula, params, ...) and open(params), which returns a
potential (domain(), identities(), taylor(n, r)) or raises Failure.
Evaluation errors at one point raise PointFailure. Every value returned must
be finite: report an overflow as ERROR_KIND_DOMAIN at its point.
"""

import math
import os
import signal
import sys
import threading
from concurrent import futures

import grpc

import controller_pb2
import controller_pb2_grpc
import health_pb2
import health_pb2_grpc
import pairwell_pb2 as pb
import pairwell_pb2_grpc

# The go-plugin handshake of pairwell (plugins/internal/wire/wire.go).
COOKIE_KEY = "PAIRWELL_PLUGIN"
COOKIE_VALUE = "pairwell-forms-7f3c9a1e5b2d4c68"
CORE_PROTOCOL = 1  # go-plugin's
PROTOCOL_VERSION = 2  # pairwell's: evaluation by Taylor coefficients
HEALTH_SERVICE = "plugin"  # the service name go-plugin's host checks

# How often the plugin looks for its parent, in seconds.
PARENT_POLL = 0.5


class Failure(Exception):
    """A failure reported to pairwell: kind is a pb.ErrorKind value."""

    def __init__(self, kind, message):
        super().__init__(message)
        self.kind = kind
        self.message = message

    def proto(self):
        return pb.Failure(kind=self.kind, message=self.message)


class PointFailure(Failure):
    """A failure at point index of an evaluation."""

    def __init__(self, index, kind, message):
        super().__init__(kind, message)
        self.index = index


class Param:
    """One parameter: name, pb.Dimension, pb.Constraint, one-line meaning."""

    def __init__(self, name, dimension, constraint, meaning):
        self.name = name
        self.dimension = dimension
        self.constraint = constraint
        self.meaning = meaning


def check_params(form, params):
    """Checks the count, finiteness and constraints of params; raises a
    Failure of kind PARAM naming the parameter."""
    if len(params) != len(form.params):
        raise Failure(pb.ERROR_KIND_PARAM, "%s: %d parameters given, the form has %d (%s)" % (
            form.key, len(params), len(form.params), ", ".join(p.name for p in form.params)))
    for p, v in zip(form.params, params):
        if not math.isfinite(v):
            raise Failure(pb.ERROR_KIND_PARAM, "%s: %s = %r is not a finite number" % (form.key, p.name, v))
        if p.constraint == pb.CONSTRAINT_POSITIVE and not v > 0:
            raise Failure(pb.ERROR_KIND_PARAM, "%s: %s = %r must be positive" % (form.key, p.name, v))
        if p.constraint == pb.CONSTRAINT_NON_NEGATIVE and not v >= 0:
            raise Failure(pb.ERROR_KIND_PARAM, "%s: %s = %r must not be negative" % (form.key, p.name, v))


def check_r(r, domain):
    """Raises a PointFailure of kind DOMAIN for the first separation outside
    the open interval (domain.min, domain.max)."""
    for i, x in enumerate(r):
        if not (domain.min < x < domain.max):
            raise PointFailure(i, pb.ERROR_KIND_DOMAIN,
                               "r = %r Å is outside the domain (%r Å, %r Å)" % (x, domain.min, domain.max))


def _info(form):
    return pb.ModelInfo(
        key=form.key, aliases=list(form.aliases), name=form.name, formula=form.formula,
        params=[pb.Param(name=p.name, dimension=p.dimension,
                         dimension_name=pb.Dimension.Name(p.dimension)[len("DIMENSION_"):].lower().replace("_", " "),
                         constraint=p.constraint, meaning=p.meaning) for p in form.params],
        domain=form.domain, reference=form.reference, notes=form.notes,
        max_order=form.max_order, matcher=False)


class FormsServicer(pairwell_pb2_grpc.FormsServicer):
    """The Forms service over a list of forms. Safe for concurrent calls."""

    def __init__(self, version, forms):
        self.version = version
        self.forms = {f.key: f for f in forms}
        self.infos = [_info(f) for f in forms]
        self.lock = threading.Lock()
        self.next = 0
        self.potentials = {}  # handle -> (form, potential)

    def Describe(self, request, context):
        return pb.DescribeResponse(plugin_version=self.version, models=self.infos)

    def Open(self, request, context):
        form = self.forms.get(request.model)
        if form is None:
            return pb.OpenResponse(failure=pb.Failure(kind=pb.ERROR_KIND_OTHER,
                                                      message="plugin serves no model %r" % request.model))
        try:
            params = list(request.params)
            check_params(form, params)
            pot = form.open(params)
            domain = pot.domain()
            ids = pot.identities()
        except Failure as f:
            return pb.OpenResponse(failure=f.proto())
        except Exception as e:  # a bug in the form: report it, keep serving
            return pb.OpenResponse(failure=pb.Failure(kind=pb.ERROR_KIND_OTHER,
                                                      message="%s: Open failed: %r" % (form.key, e)))
        with self.lock:
            self.next += 1
            handle = self.next
            self.potentials[handle] = (form, pot)
        return pb.OpenResponse(handle=handle, domain=domain, identities=ids)

    def Evaluate(self, request, context):
        with self.lock:
            entry = self.potentials.get(request.handle)
        if entry is None:
            return pb.EvaluateResponse(failure=pb.Failure(kind=pb.ERROR_KIND_OTHER,
                                                          message="unknown handle %d" % request.handle))
        form, pot = entry
        n = request.order
        if not 0 <= n <= form.max_order:
            return pb.EvaluateResponse(failure=pb.Failure(
                kind=pb.ERROR_KIND_ORDER,
                message="%s: Taylor order %d not supported (0 to %d)" % (form.key, n, form.max_order)))
        try:
            values = pot.taylor(n, request.r)
        except PointFailure as f:
            return pb.EvaluateResponse(point_failure=pb.PointFailure(index=f.index, failure=f.proto()))
        except Failure as f:
            return pb.EvaluateResponse(failure=f.proto())
        except Exception as e:
            return pb.EvaluateResponse(failure=pb.Failure(kind=pb.ERROR_KIND_OTHER,
                                                          message="%s: Evaluate failed: %r" % (form.key, e)))
        return pb.EvaluateResponse(values=values)

    def Close(self, request, context):
        with self.lock:
            self.potentials.pop(request.handle, None)
        return pb.CloseResponse()

    def Match(self, request, context):
        return pb.MatchResponse(failure=pb.Failure(
            kind=pb.ERROR_KIND_UNSUPPORTED, message="%s: matching a target well is not offered" % request.model))


class HealthServicer(health_pb2_grpc.HealthServicer):
    """grpc.health.v1.Health: SERVING for the whole server and for "plugin"."""

    def Check(self, request, context):
        if request.service not in ("", HEALTH_SERVICE):
            context.abort(grpc.StatusCode.NOT_FOUND, "unknown service %r" % request.service)
        return health_pb2.HealthCheckResponse(status=health_pb2.HealthCheckResponse.SERVING)


class ControllerServicer(controller_pb2_grpc.GRPCControllerServicer):
    """go-plugin's controller: Shutdown asks the plugin to exit."""

    def __init__(self, stop):
        self.stop = stop

    def Shutdown(self, request, context):
        self.stop.set()
        return controller_pb2.Empty()


def direct_run_message(path, version, keys):
    """What the plugin says when a person runs it."""
    path = os.path.abspath(path)
    return ("%s is a pairwell plugin %s (forms: %s); pairwell starts it, it is not run by itself.\n"
            "Use it with:  pairwell --plugin %s models\n"
            "or put it, named pairwell-plugin-*, in a directory listed in PAIRWELL_PLUGIN_PATH.\n"
            % (os.path.basename(path), version, ", ".join(keys), path))


def _listen(server):
    """Binds server as go-plugin's host asks; returns (network, address)."""
    sockdir = os.environ.get("PLUGIN_UNIX_SOCKET_DIR", "")
    if sockdir:
        path = os.path.join(sockdir, "pairwell-py-%d.sock" % os.getpid())
        if not server.add_insecure_port("unix:" + path):
            raise RuntimeError("cannot listen on the Unix socket %s" % path)
        return "unix", path
    lo = int(os.environ.get("PLUGIN_MIN_PORT", "0") or 0)
    hi = int(os.environ.get("PLUGIN_MAX_PORT", "0") or 0)
    ports = range(lo, hi + 1) if 0 < lo <= hi else [0]
    for port in ports:
        try:
            bound = server.add_insecure_port("127.0.0.1:%d" % port)
        except RuntimeError:  # grpcio raises when a port is taken
            continue
        if bound:
            return "tcp", "127.0.0.1:%d" % bound
    raise RuntimeError("no free TCP port in %d..%d" % (lo, hi))


def _watch_parent(stop):
    ppid = os.getppid()
    while not stop.wait(PARENT_POLL):
        if os.getppid() != ppid:  # re-parented: the host is gone
            os._exit(1)


def serve(version, forms, argv0=None):
    """Serves forms as a pairwell plugin of the given version (the plugin's
    own, shown by "pairwell models") until pairwell stops it."""
    argv0 = argv0 or sys.argv[0]
    if os.environ.get(COOKIE_KEY) != COOKIE_VALUE:
        sys.stderr.write(direct_run_message(argv0, version, [f.key for f in forms]))
        sys.exit(1)
    stop = threading.Event()
    for sig in (signal.SIGTERM, signal.SIGINT, signal.SIGHUP):
        signal.signal(sig, lambda *_: stop.set())
    threading.Thread(target=_watch_parent, args=(stop,), daemon=True).start()

    server = grpc.server(futures.ThreadPoolExecutor(max_workers=4))
    pairwell_pb2_grpc.add_FormsServicer_to_server(FormsServicer(version, forms), server)
    health_pb2_grpc.add_HealthServicer_to_server(HealthServicer(), server)
    controller_pb2_grpc.add_GRPCControllerServicer_to_server(ControllerServicer(stop), server)
    network, address = _listen(server)
    server.start()

    out = sys.stdout
    out.write("%d|%d|%s|%s|grpc|\n" % (CORE_PROTOCOL, PROTOCOL_VERSION, network, address))
    out.flush()
    sys.stdout = sys.stderr  # nothing else may reach the handshake pipe

    # Event.wait without a timeout would not let the signal handlers run.
    while not stop.wait(PARENT_POLL):
        pass
    server.stop(grace=0.2).wait(1)
    if network == "unix":
        try:
            os.unlink(address)
        except OSError:
            pass
    # grpc's threads may still hold the interpreter; leave at once.
    sys.stderr.flush()
    os._exit(0)
