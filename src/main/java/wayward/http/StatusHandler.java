package wayward.http;

import static wayward.http.Replies.response;
import static wayward.http.Replies.send;
import static wayward.http.Replies.text;

import io.netty.channel.ChannelHandlerContext;
import io.netty.channel.SimpleChannelInboundHandler;
import io.netty.handler.codec.TooLongFrameException;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.FullHttpResponse;
import io.netty.handler.codec.http.HttpHeaderNames;
import io.netty.handler.codec.http.HttpMethod;
import io.netty.handler.codec.http.HttpResponseStatus;
import io.netty.handler.codec.http.QueryStringDecoder;
import io.netty.handler.timeout.IdleStateEvent;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.security.MessageDigest;
import java.util.List;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.secret.LogText;

/**
 * Routes one connection's requests (GET and HEAD only) to their responders; every refusal is a short plain-text
 * 4xx naming the reason. Open to all: {@code /health}, {@code /health/ready}, {@code /view.js} (the live page's
 * script, no site data) and {@code /openapi.json} (the description of the JSON answers, no site data). With a
 * bearer token set, everything else needs it: {@code /} (the site page: cameras, recent events, one event),
 * {@code /view/<camera>} (live view page), {@code /live/<camera>.jpg} and {@code /live/<camera>.mjpeg}
 * ({@link LiveStream}), {@code /api/measure} (a drawn zone on the live flow), {@code /metrics},
 * {@code /api/cameras}, {@code /api/events?limit=N} ({@link Views}), {@code /api/evidence} and
 * {@code /evidence/<path>} ({@link EvidenceFiles}).
 */
final class StatusHandler extends SimpleChannelInboundHandler<FullHttpRequest> {
    private static final Logger LOG = LoggerFactory.getLogger(StatusHandler.class);
    /** One budget of error lines for the whole status server. */
    private static final ErrorLines ERRORS = new ErrorLines(LOG);

    /** What all connections share. */
    record Shared(StatusSource service, byte[] token, String tokenName) {
    }

    private final Shared shared;
    private final Views views;
    private final EvidenceFiles evidence;
    private final MuteRequests mutes;

    StatusHandler(Shared shared) {
        this(shared, new EvidenceFiles(() -> shared.service().evidenceDir()));
    }

    StatusHandler(Shared shared, EvidenceFiles evidence) {
        this.shared = shared;
        this.views = new Views(shared.service());
        this.mutes = new MuteRequests(shared.service(), java.time.Clock.systemUTC());
        this.evidence = evidence;
    }

    @Override
    protected void channelRead0(ChannelHandlerContext ctx, FullHttpRequest req) {
        if (req.decoderResult().isFailure()) {
            Throwable why = req.decoderResult().cause();
            if (why instanceof TooLongFrameException) {
                String m = String.valueOf(why.getMessage());
                HttpResponseStatus s = m.contains("header") ? HttpResponseStatus.REQUEST_HEADER_FIELDS_TOO_LARGE
                        : HttpResponseStatus.REQUEST_URI_TOO_LONG;
                text(ctx, req, s, "request too large: " + m + "\n", true);
            } else {
                text(ctx, req, HttpResponseStatus.BAD_REQUEST, "malformed request\n", true);
            }
            return;
        }
        if (req.method().equals(HttpMethod.POST)) {
            post(ctx, req);
            return;
        }
        if (!req.method().equals(HttpMethod.GET) && !req.method().equals(HttpMethod.HEAD)) {
            FullHttpResponse r = response(HttpResponseStatus.METHOD_NOT_ALLOWED, "only GET and HEAD\n", "text/plain");
            r.headers().set(HttpHeaderNames.ALLOW, "GET, HEAD");
            send(ctx, req, r);
            return;
        }
        // ";" is part of a value (the polygon), not a separator
        QueryStringDecoder q = new QueryStringDecoder(req.uri(), StandardCharsets.UTF_8, true, 1024, true);
        String path = q.rawPath();
        try {
            q.parameters();
            QueryStringDecoder.decodeComponent(path, StandardCharsets.UTF_8);
        } catch (IllegalArgumentException e) {
            // a broken %-escape is the client's mistake: 400, and nothing of the address (tokens) in the log
            text(ctx, req, HttpResponseStatus.BAD_REQUEST, "malformed percent-escape in the address\n", false);
            return;
        }
        try {
            if (path.equals("/health") || path.equals("/health/ready")) {
                views.health(ctx, req, path.endsWith("/ready"));
                return;
            }
            if (path.equals("/view.js")) {
                Views.page(ctx, req, "view.js");
                return;
            }
            if (path.equals("/openapi.json")) {
                Views.openapi(ctx, req);
                return;
            }
            if (!authorised(req)) {
                FullHttpResponse r = response(HttpResponseStatus.UNAUTHORIZED,
                        "a bearer token is required (Authorization: Bearer …)\n", "text/plain");
                r.headers().set(HttpHeaderNames.WWW_AUTHENTICATE, "Bearer realm=\"wayward\"");
                send(ctx, req, r);
                return;
            }
            route(ctx, req, q, path);
        } catch (RuntimeException | IOException e) {
            ERRORS.error("status server: " + req.method() + " " + LogText.clean(path) + " failed: "
                    + LogText.clean(e.toString()), System.nanoTime());
            text(ctx, req, HttpResponseStatus.INTERNAL_SERVER_ERROR, "internal error\n", true);
        }
    }

    private void route(ChannelHandlerContext ctx, FullHttpRequest req, QueryStringDecoder q, String path)
            throws IOException {
        switch (path) {
            case "/" -> Views.page(ctx, req, "index.html");
            case "/api/measure" -> views.measure(ctx, req, q);
            case "/metrics" -> views.metrics(ctx, req);
            case "/api/cameras" -> views.cameras(ctx, req);
            case "/api/events" -> views.events(ctx, req, q);
            case "/api/evidence" -> evidence.list(ctx, req, q);
            case "/api/mutes" -> mutes.list(ctx, req);
            default -> {
                if (path.startsWith("/view/")) {
                    views.view(ctx, req, path.substring("/view/".length()));
                } else if (path.startsWith("/live/") && path.endsWith(".jpg")) {
                    views.picture(ctx, req, path.substring(6, path.length() - 4));
                } else if (path.startsWith("/live/") && path.endsWith(".mjpeg")) {
                    LiveStream.start(ctx, req, views.camera(path.substring(6, path.length() - 6)));
                } else if (path.startsWith("/evidence/")) {
                    evidence.serve(ctx, req, path.substring("/evidence/".length()));
                } else {
                    text(ctx, req, HttpResponseStatus.NOT_FOUND, "no such page: " + LogText.clean(path) + "\n", false);
                }
            }
        }
    }

    /**
     * POST: only {@code /api/mutes} and {@code /api/mutes/end}, and only with the bearer token in the Authorization
     * header, even on loopback (a change of state needs a name to record; a page's address cannot carry it).
     */
    private void post(ChannelHandlerContext ctx, FullHttpRequest req) {
        String path = new QueryStringDecoder(req.uri()).rawPath();
        if (!path.equals("/api/mutes") && !path.equals("/api/mutes/end")) {
            FullHttpResponse r = response(HttpResponseStatus.METHOD_NOT_ALLOWED, "only GET and HEAD here; POST only "
                    + "to /api/mutes and /api/mutes/end\n", "text/plain");
            r.headers().set(HttpHeaderNames.ALLOW, "GET, HEAD");
            send(ctx, req, r);
            return;
        }
        String h = req.headers().get(HttpHeaderNames.AUTHORIZATION);
        String given = h != null && h.regionMatches(true, 0, "Bearer ", 0, 7) ? h.substring(7).trim() : null;
        if (shared.token() == null || given == null
                || !MessageDigest.isEqual(given.getBytes(StandardCharsets.UTF_8), shared.token())) {
            FullHttpResponse r = response(HttpResponseStatus.UNAUTHORIZED, shared.token() == null
                    ? "muting needs a bearer token: set [service] token_file, and send it as Authorization: Bearer …\n"
                    : "a bearer token is required in the Authorization header (Authorization: Bearer …)\n",
                    "text/plain");
            r.headers().set(HttpHeaderNames.WWW_AUTHENTICATE, "Bearer realm=\"wayward\"");
            send(ctx, req, r);
            return;
        }
        try {
            mutes.change(ctx, req, path.equals("/api/mutes"), shared.tokenName());
        } catch (RuntimeException e) {
            ERRORS.error("status server: POST " + LogText.clean(path) + " failed: " + LogText.clean(e.toString()),
                    System.nanoTime());
            text(ctx, req, HttpResponseStatus.INTERNAL_SERVER_ERROR, "internal error\n", true);
        }
    }

    /**
     * The bearer token from the Authorization header, or from an {@code access_token} query parameter (RFC 6750
     * §2.3), which a browser's picture and page requests can carry.
     */
    private boolean authorised(FullHttpRequest req) {
        if (shared.token() == null) {
            return true;
        }
        String given = null;
        String h = req.headers().get(HttpHeaderNames.AUTHORIZATION);
        if (h != null && h.regionMatches(true, 0, "Bearer ", 0, 7)) {
            given = h.substring(7).trim();
        } else {
            List<String> q = new QueryStringDecoder(req.uri()).parameters().get("access_token");
            if (q != null && !q.isEmpty()) {
                given = q.get(0);
            }
        }
        return given != null && MessageDigest.isEqual(given.getBytes(StandardCharsets.UTF_8), shared.token());
    }

    @Override
    public void userEventTriggered(ChannelHandlerContext ctx, Object evt) throws Exception {
        if (evt instanceof IdleStateEvent) {
            ctx.close();
            return;
        }
        super.userEventTriggered(ctx, evt);
    }

    @Override
    public void exceptionCaught(ChannelHandlerContext ctx, Throwable cause) {
        LOG.debug("status server: {}", cause.toString());
        ctx.close();
    }
}
