package wayward.http;

import io.netty.buffer.ByteBuf;
import io.netty.buffer.Unpooled;
import io.netty.channel.ChannelFutureListener;
import io.netty.channel.ChannelHandlerContext;
import io.netty.handler.codec.http.DefaultFullHttpResponse;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.FullHttpResponse;
import io.netty.handler.codec.http.HttpHeaderNames;
import io.netty.handler.codec.http.HttpHeaderValues;
import io.netty.handler.codec.http.HttpMethod;
import io.netty.handler.codec.http.HttpResponseStatus;
import io.netty.handler.codec.http.HttpUtil;
import io.netty.handler.codec.http.HttpVersion;
import io.netty.handler.codec.http.QueryStringDecoder;
import java.nio.charset.StandardCharsets;
import java.util.List;

/** How the status server's responders answer: whole bodies, never cached, HEAD without a body, keep-alive kept. */
final class Replies {
    static final String JSON = "application/json";
    static final String TEXT = "text/plain; charset=utf-8";

    private Replies() {
    }

    /** A whole response with its length, not to be cached. */
    static FullHttpResponse response(HttpResponseStatus status, String body, String type) {
        ByteBuf content = Unpooled.copiedBuffer(body, StandardCharsets.UTF_8);
        FullHttpResponse r = new DefaultFullHttpResponse(HttpVersion.HTTP_1_1, status, content);
        r.headers().set(HttpHeaderNames.CONTENT_TYPE, type);
        r.headers().set(HttpHeaderNames.CONTENT_LENGTH, content.readableBytes());
        r.headers().set(HttpHeaderNames.CACHE_CONTROL, "no-store");
        return r;
    }

    /** A short plain-text answer (a refusal names its reason); {@code close} ends the connection after it. */
    static void text(ChannelHandlerContext ctx, FullHttpRequest req, HttpResponseStatus s, String body,
            boolean close) {
        FullHttpResponse r = response(s, body, TEXT);
        if (close) {
            r.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.CLOSE);
            ctx.writeAndFlush(r).addListener(ChannelFutureListener.CLOSE);
            return;
        }
        send(ctx, req, r);
    }

    /** A JSON body with a final newline. */
    static void json(ChannelHandlerContext ctx, FullHttpRequest req, HttpResponseStatus s, String body) {
        send(ctx, req, response(s, body + "\n", JSON));
    }

    /** Sends a response, without its body for HEAD, closing the connection unless the request keeps it. */
    static void send(ChannelHandlerContext ctx, FullHttpRequest req, FullHttpResponse r) {
        boolean keepAlive = HttpUtil.isKeepAlive(req);
        if (req.method().equals(HttpMethod.HEAD)) {
            r.content().clear();
        }
        if (keepAlive) {
            r.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.KEEP_ALIVE);
            ctx.writeAndFlush(r);
        } else {
            r.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.CLOSE);
            ctx.writeAndFlush(r).addListener(ChannelFutureListener.CLOSE);
        }
    }

    /** The first value of a query parameter, or the fallback. */
    static String first(QueryStringDecoder q, String name, String fallback) {
        List<String> v = q.parameters().get(name);
        return v == null || v.isEmpty() ? fallback : v.get(0);
    }

    /**
     * A whole-number query parameter from min to max, the fallback when absent; null after answering 400 (the
     * caller returns).
     */
    static Integer whole(ChannelHandlerContext ctx, FullHttpRequest req, QueryStringDecoder q, String name,
            int fallback, int min, int max) {
        String v = first(q, name, null);
        if (v == null) {
            return fallback;
        }
        try {
            int n = Integer.parseInt(v);
            if (n >= min && n <= max) {
                return n;
            }
        } catch (NumberFormatException e) {
            // answered below
        }
        text(ctx, req, HttpResponseStatus.BAD_REQUEST, name + ": a whole number from " + min + " to " + max + "\n",
                false);
        return null;
    }
}
