package wayward.service;

import io.netty.buffer.Unpooled;
import io.netty.channel.Channel;
import io.netty.channel.EventLoopGroup;
import io.netty.channel.MultiThreadIoEventLoopGroup;
import io.netty.channel.epoll.Epoll;
import io.netty.channel.epoll.EpollDomainDatagramChannel;
import io.netty.channel.epoll.EpollIoHandler;
import io.netty.channel.unix.DomainSocketAddress;
import io.netty.util.concurrent.DefaultThreadFactory;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.analysis.CameraPipeline;

/**
 * systemd's notify protocol (sd_notify(3)): newline-separated {@code KEY=VALUE} datagrams to the Unix socket
 * named by {@code NOTIFY_SOCKET} (a path, or {@code @name} in the abstract namespace). Sends READY=1 once the
 * cameras run, RELOADING=1 / READY=1 around a reload, STOPPING=1 at shutdown, and WATCHDOG=1 at half the
 * interval systemd asks for ({@code WATCHDOG_USEC}) while the health check passes. Without NOTIFY_SOCKET
 * (not under systemd) it does nothing. The datagrams go through Netty's epoll transport.
 */
public final class SystemdNotify implements AutoCloseable {
    private static final Logger LOG = LoggerFactory.getLogger(SystemdNotify.class);

    private final EventLoopGroup group;
    private final Channel channel;
    private final Service service;
    private final Map<String, long[]> lastAnalysed = new HashMap<>();

    private SystemdNotify(EventLoopGroup group, Channel channel, Service service) {
        this.group = group;
        this.channel = channel;
        this.service = service;
    }

    /** Connects to NOTIFY_SOCKET when set; null when not under systemd or when the transport is missing. */
    public static SystemdNotify fromEnvironment(Service service) {
        String socket = System.getenv("NOTIFY_SOCKET");
        if (socket == null || socket.isEmpty()) {
            return null;
        }
        if (!Epoll.isAvailable()) {
            LOG.warn("systemd: NOTIFY_SOCKET is set but Netty's epoll transport is not available here ({}); "
                    + "use Type=simple in the unit", Epoll.unavailabilityCause().toString());
            return null;
        }
        // an abstract-namespace socket is written with a leading '@' and addressed with a leading NUL byte
        String path = socket.startsWith("@") ? "\0" + socket.substring(1) : socket;
        EventLoopGroup group = new MultiThreadIoEventLoopGroup(1, new DefaultThreadFactory("systemd-notify", true),
                EpollIoHandler.newFactory());
        try {
            Channel ch = new io.netty.bootstrap.Bootstrap().group(group).channel(EpollDomainDatagramChannel.class)
                    .handler(new io.netty.channel.ChannelInboundHandlerAdapter())
                    .connect(new DomainSocketAddress(path)).sync().channel();
            SystemdNotify n = new SystemdNotify(group, ch, service);
            String usec = System.getenv("WATCHDOG_USEC");
            if (usec != null && !usec.isEmpty()) {
                long micros = Long.parseLong(usec.trim());
                long every = Math.max(1000, micros / 2000); // half the interval, in ms (sd_watchdog_enabled(3))
                group.scheduleAtFixedRate(n::watchdog, every, every, TimeUnit.MILLISECONDS);
                LOG.info("systemd: watchdog every {} ms", every);
            }
            return n;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            group.shutdownGracefully(0, 1, TimeUnit.SECONDS);
            return null;
        } catch (RuntimeException e) {
            LOG.warn("systemd: cannot reach the notify socket {}: {}", socket, e.toString());
            group.shutdownGracefully(0, 1, TimeUnit.SECONDS);
            return null;
        }
    }

    /** Sends one state message, e.g. "READY=1\nSTATUS=watching 3 cameras". */
    public void send(String state) {
        channel.writeAndFlush(Unpooled.copiedBuffer(state, StandardCharsets.UTF_8))
                .addListener(f -> {
                    if (!f.isSuccess()) {
                        LOG.warn("systemd: notify \"{}\" failed: {}", state.replace('\n', ' '), f.cause().toString());
                    }
                });
    }

    /**
     * The health check behind each watchdog ping: an analysis thread that has frames to work on but has not
     * taken one since the last ping is stuck, and then no ping goes out (systemd restarts the service once
     * its WatchdogSec passes).
     */
    private void watchdog() {
        String stuck = null;
        for (CameraPipeline p : service.pipelines()) {
            long analysed = p.analysedFrames();
            long in = p.framesIn();
            long[] before = lastAnalysed.put(p.id(), new long[] {analysed, in});
            if (before != null && p.running() && in > before[1] && analysed == before[0]) {
                stuck = p.id();
            }
        }
        if (stuck != null) {
            LOG.error("systemd: camera {} receives pictures but its analysis has not moved since the last check; "
                    + "holding back the watchdog ping", stuck);
            return;
        }
        send("WATCHDOG=1");
    }

    @Override
    public void close() {
        channel.close().awaitUninterruptibly(1000);
        group.shutdownGracefully(0, 1, TimeUnit.SECONDS).awaitUninterruptibly(2000);
    }
}
