package wayward.delivery;

import io.netty.bootstrap.Bootstrap;
import io.netty.buffer.Unpooled;
import io.netty.channel.Channel;
import io.netty.channel.ChannelHandlerContext;
import io.netty.channel.ChannelInitializer;
import io.netty.channel.ChannelOption;
import io.netty.channel.EventLoopGroup;
import io.netty.channel.MultiThreadIoEventLoopGroup;
import io.netty.channel.SimpleChannelInboundHandler;
import io.netty.channel.nio.NioIoHandler;
import io.netty.channel.socket.SocketChannel;
import io.netty.channel.socket.nio.NioSocketChannel;
import io.netty.handler.codec.http.DefaultFullHttpRequest;
import io.netty.handler.codec.http.FullHttpRequest;
import io.netty.handler.codec.http.HttpClientCodec;
import io.netty.handler.codec.http.HttpHeaderNames;
import io.netty.handler.codec.http.HttpHeaderValues;
import io.netty.handler.codec.http.HttpMethod;
import io.netty.handler.codec.http.HttpObject;
import io.netty.handler.codec.http.HttpResponse;
import io.netty.handler.codec.http.HttpVersion;
import io.netty.handler.ssl.SslContext;
import io.netty.handler.timeout.ReadTimeoutHandler;
import io.netty.util.concurrent.DefaultThreadFactory;
import java.net.URI;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.secret.Urls;

/**
 * POSTs each event phase as JSON to a webhook URL over Netty (HTTP/1.1, one connection per attempt; HTTPS with
 * the JDK's trust store plus an optional CA file, host name checked). 2xx = delivered; 4xx other than 408 and
 * 429 = refused for good; other answers, timeouts and connection errors = try again (the {@link Courier}
 * waits with backoff and jitter and the phase stays in the outbox meanwhile). One attempt per {@link #send}.
 */
public final class WebhookSender implements Destination {
    /** Header naming the event, so receivers can drop duplicates of an at-least-once delivery. */
    public static final String EVENT_ID_HEADER = "X-Wayward-Event-Id";

    private final WebhookConfig config;
    private final URI uri;
    private final String shownUrl;
    private final EventLoopGroup group;
    private final SslContext ssl;
    private final WebhookSignature signature;

    public WebhookSender(WebhookConfig config) {
        this.config = config;
        this.uri = URI.create(config.url());
        this.shownUrl = Urls.mask(config.url());
        this.signature = config.secret() != null ? new WebhookSignature(config.secret()) : null;
        this.group = new MultiThreadIoEventLoopGroup(1, new DefaultThreadFactory("webhook", true),
                NioIoHandler.newFactory());
        this.ssl = "https".equalsIgnoreCase(uri.getScheme()) ? TlsTrust.clientContext(config.caFile(), shownUrl) : null;
    }

    @Override
    public String name() {
        return "webhook " + shownUrl;
    }

    @Override
    public String key() {
        return "webhook-" + TlsTrust.shortHash(config.url());
    }

    @Override
    public CompletableFuture<Result> send(long seq, Event event) {
        byte[] body = EventJson.toJson(event).getBytes(StandardCharsets.UTF_8);
        try {
            int status = post(body, event.id());
            return CompletableFuture.completedFuture(classify(status));
        } catch (TimeoutException e) {
            return CompletableFuture.completedFuture(Result.retry("no answer within " + config.timeoutSeconds() + " s"));
        } catch (ExecutionException e) {
            Throwable c = e.getCause() != null ? e.getCause() : e;
            return CompletableFuture.completedFuture(
                    Result.retry(c.getMessage() != null ? c.getMessage() : c.getClass().getSimpleName()));
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return CompletableFuture.completedFuture(Result.retry("interrupted"));
        }
    }

    /** 2xx delivered; 4xx other than 408 and 429 refused for good; the rest tried again. */
    static Result classify(int status) {
        if (status >= 200 && status < 300) {
            return Result.DELIVERED;
        }
        if (status >= 400 && status < 500 && status != 408 && status != 429) {
            return Result.refused("HTTP " + status);
        }
        return Result.retry("HTTP " + status);
    }

    /** One POST; returns the status code. */
    private int post(byte[] body, String eventId) throws InterruptedException, ExecutionException, TimeoutException {
        String host = uri.getHost();
        boolean tls = ssl != null;
        int port = uri.getPort() > 0 ? uri.getPort() : (tls ? 443 : 80);
        long timeoutMillis = (long) (config.timeoutSeconds() * 1000);
        CompletableFuture<Integer> answer = new CompletableFuture<>();
        Bootstrap b = new Bootstrap()
                .group(group)
                .channel(NioSocketChannel.class)
                .option(ChannelOption.CONNECT_TIMEOUT_MILLIS, (int) Math.max(1, timeoutMillis))
                .handler(new ChannelInitializer<SocketChannel>() {
                    @Override
                    protected void initChannel(SocketChannel ch) {
                        if (tls) {
                            ch.pipeline().addLast(ssl.newHandler(ch.alloc(), host, port));
                        }
                        ch.pipeline().addLast(new ReadTimeoutHandler(timeoutMillis, TimeUnit.MILLISECONDS));
                        ch.pipeline().addLast(new HttpClientCodec());
                        // the answer's status is all we read: a body of any size is not our concern
                        ch.pipeline().addLast(new SimpleChannelInboundHandler<HttpObject>() {
                            @Override
                            protected void channelRead0(ChannelHandlerContext ctx, HttpObject o) {
                                if (o instanceof HttpResponse r) {
                                    answer.complete(r.status().code());
                                    ctx.close();
                                }
                            }

                            @Override
                            public void exceptionCaught(ChannelHandlerContext ctx, Throwable cause) {
                                answer.completeExceptionally(cause);
                                ctx.close();
                            }

                            @Override
                            public void channelInactive(ChannelHandlerContext ctx) {
                                answer.completeExceptionally(new IllegalStateException("connection closed without an answer"));
                            }
                        });
                    }
                });
        String path = uri.getRawPath() == null || uri.getRawPath().isEmpty() ? "/" : uri.getRawPath();
        if (uri.getRawQuery() != null) {
            path += "?" + uri.getRawQuery();
        }
        FullHttpRequest req = new DefaultFullHttpRequest(HttpVersion.HTTP_1_1, HttpMethod.POST, path,
                Unpooled.wrappedBuffer(body));
        req.headers().set(HttpHeaderNames.HOST, uri.getPort() > 0 ? host + ":" + port : host);
        req.headers().set(HttpHeaderNames.CONTENT_TYPE, HttpHeaderValues.APPLICATION_JSON);
        req.headers().set(HttpHeaderNames.CONTENT_LENGTH, body.length);
        req.headers().set(HttpHeaderNames.CONNECTION, HttpHeaderValues.CLOSE);
        req.headers().set(HttpHeaderNames.USER_AGENT, "wayward");
        for (java.util.Map.Entry<String, String> h : config.headers().entrySet()) {
            req.headers().set(h.getKey(), h.getValue());
        }
        req.headers().set(EVENT_ID_HEADER, eventId);
        if (signature != null) {
            // signed per attempt: the timestamp is the sending time, so a receiver can refuse stale replays
            long now = System.currentTimeMillis() / 1000;
            req.headers().set(WebhookSignature.TIMESTAMP_HEADER, Long.toString(now));
            req.headers().set(WebhookSignature.SIGNATURE_HEADER, signature.sign(now, body));
        }
        Channel ch = null;
        try {
            io.netty.channel.ChannelFuture connect = b.connect(host, port);
            if (!connect.await(timeoutMillis)) {
                connect.cancel(true);
                throw new TimeoutException("connect");
            }
            if (!connect.isSuccess()) {
                throw new ExecutionException(connect.cause());
            }
            ch = connect.channel();
            ch.writeAndFlush(req).addListener(f -> {
                if (!f.isSuccess()) {
                    answer.completeExceptionally(f.cause());
                }
            });
            return answer.get(timeoutMillis + 1000, TimeUnit.MILLISECONDS);
        } finally {
            if (ch != null) {
                ch.close();
            }
        }
    }

    @Override
    public void close() {
        group.shutdownGracefully(0, 2, TimeUnit.SECONDS).awaitUninterruptibly(3000);
    }
}
