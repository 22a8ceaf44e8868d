package wayward.http;

import io.netty.bootstrap.ServerBootstrap;
import io.netty.channel.Channel;
import io.netty.channel.ChannelInitializer;
import io.netty.channel.EventLoopGroup;
import io.netty.channel.MultiThreadIoEventLoopGroup;
import io.netty.channel.nio.NioIoHandler;
import io.netty.channel.socket.SocketChannel;
import io.netty.channel.socket.nio.NioServerSocketChannel;
import io.netty.handler.codec.http.HttpObjectAggregator;
import io.netty.handler.codec.http.HttpServerCodec;
import io.netty.handler.stream.ChunkedWriteHandler;
import io.netty.handler.timeout.IdleStateHandler;
import io.netty.util.concurrent.DefaultThreadFactory;
import java.io.IOException;
import java.net.InetSocketAddress;
import java.util.concurrent.TimeUnit;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The status server (Netty, HTTP/1.1): health, Prometheus metrics, a JSON API, clip downloads and the live
 * view. Requests are bounded (request line 4 KiB, headers 8 KiB, body 16 KiB), idle connections close after
 * 60 s, and a bearer token guards everything but {@code /health} when one is configured.
 */
public final class StatusServer implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(StatusServer.class);
    static final int MAX_LINE = 4096;
    static final int MAX_HEADERS = 8192;
    static final int MAX_BODY = 16 * 1024;

    /** Threads that answer requests, apart from the one that reads and writes the sockets. */
    static final int WORKERS = 4;

    private final EventLoopGroup group;
    private final io.netty.util.concurrent.EventExecutorGroup workers;
    private final Channel channel;

    private StatusServer(EventLoopGroup group, io.netty.util.concurrent.EventExecutorGroup workers, Channel channel) {
        this.workers = workers;
        this.group = group;
        this.channel = channel;
    }

    /**
     * Binds and serves; when the address cannot be used, throws an IOException whose message is one line naming
     * the address and the reason, e.g. {@code 127.0.0.1:7431: address already in use}.
     */
    public static StatusServer start(HttpConfig config, StatusSource service) throws IOException {
        return start(config, service, HttpConfig.HEADER_SECONDS);
    }

    /** As {@link #start(HttpConfig, StatusSource)} with another request deadline (tests). */
    static StatusServer start(HttpConfig config, StatusSource service, int headerSeconds) throws IOException {
        EventLoopGroup group = new MultiThreadIoEventLoopGroup(1, new DefaultThreadFactory("http", true),
                NioIoHandler.newFactory());
        StatusHandler.Shared shared = new StatusHandler.Shared(service, config.token(), config.tokenName());
        ConnectionLimits.Cap cap = new ConnectionLimits.Cap(config.maxConnections());
        // answers (a clip listing over a large folder, JPEG encoding) run off the socket thread, so that a slow one
        // never holds up /health or the other connections' reads and writes
        io.netty.util.concurrent.EventExecutorGroup workers = new io.netty.util.concurrent.DefaultEventExecutorGroup(
                WORKERS, new DefaultThreadFactory("http-work", true));
        ServerBootstrap b = new ServerBootstrap()
                .group(group)
                .channel(NioServerSocketChannel.class)
                .childHandler(new ChannelInitializer<SocketChannel>() {
                    @Override
                    protected void initChannel(SocketChannel ch) {
                        ch.pipeline().addLast(cap);
                        ch.pipeline().addLast(new IdleStateHandler(0, 0, HttpConfig.IDLE_SECONDS, TimeUnit.SECONDS));
                        ch.pipeline().addLast(new HttpServerCodec(MAX_LINE, MAX_HEADERS, 8192));
                        ch.pipeline().addLast(new HttpObjectAggregator(MAX_BODY));
                        ch.pipeline().addLast(new ConnectionLimits.HeaderDeadline(headerSeconds));
                        ch.pipeline().addLast(new ChunkedWriteHandler());
                        ch.pipeline().addLast(workers, new StatusHandler(shared));
                    }
                });
        try {
            Channel ch = b.bind(config.host(), config.port()).sync().channel();
            InetSocketAddress at = (InetSocketAddress) ch.localAddress();
            LOG.info("status server on http://{}:{}/ (health, metrics, API, live view){}", config.host(),
                    at.getPort(), config.token() != null ? "; a bearer token is required for all but /health" : "");
            return new StatusServer(group, workers, ch);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            group.shutdownGracefully(0, 1, TimeUnit.SECONDS);
            workers.shutdownGracefully(0, 1, TimeUnit.SECONDS);
            throw new IOException(config.host() + ":" + config.port() + ": interrupted while binding");
        } catch (Exception e) {
            // Netty's sync() rethrows the bind's own exception, a checked java.net.BindException among them
            group.shutdownGracefully(0, 1, TimeUnit.SECONDS);
            workers.shutdownGracefully(0, 1, TimeUnit.SECONDS);
            throw new IOException(config.host() + ":" + config.port() + ": " + reason(e), e);
        }
    }

    /** The plain reason of a failed bind, e.g. "address already in use" (the JDK's text, lower-cased first). */
    static String reason(Throwable e) {
        String m = e.getMessage();
        if (m == null || m.isBlank()) {
            return e.getClass().getSimpleName();
        }
        m = m.strip();
        int nl = m.indexOf('\n');
        m = nl < 0 ? m : m.substring(0, nl).strip();
        return Character.toLowerCase(m.charAt(0)) + m.substring(1);
    }

    public int port() {
        return ((InetSocketAddress) channel.localAddress()).getPort();
    }

    @Override
    public void close() {
        channel.close().awaitUninterruptibly(2000);
        group.shutdownGracefully(0, 2, TimeUnit.SECONDS).awaitUninterruptibly(3000);
        workers.shutdownGracefully(0, 2, TimeUnit.SECONDS).awaitUninterruptibly(3000);
    }
}
