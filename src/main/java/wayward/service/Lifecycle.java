package wayward.service;

import java.io.IOException;
import java.nio.file.Path;
import java.util.concurrent.atomic.AtomicBoolean;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.config.ConfigException;
import wayward.config.ConfigLoader;
import wayward.http.HttpConfig;
import wayward.config.SiteConfig;
import wayward.secret.LogText;

/**
 * Runs a service until its cameras end or a signal stops it: a shutdown hook for SIGTERM and Ctrl-C, SIGHUP to
 * read the config again (a bad file is refused and the running config stays), systemd's notify protocol, and
 * the status server's lifetime (bound before anything else starts, so that an address in use fails the start
 * before a camera, the event log or the outbox is touched; closed last, so health and metrics answer while the
 * rest shuts down).
 */
public final class Lifecycle {
    private static final Logger LOG = LoggerFactory.getLogger(Lifecycle.class);

    /** Starts the status server of a service (the http package does; this one does not depend on it). */
    @FunctionalInterface
    public interface StatusServerStarter {
        AutoCloseable start(HttpConfig config, Service service) throws IOException;
    }

    /** The service could not start; the message is one line for the operator (the cli prints it and exits). */
    public static final class StartFailed extends Exception {
        private static final long serialVersionUID = 1L;

        StartFailed(String message, Throwable cause) {
            super(message, cause);
        }
    }

    private Lifecycle() {
    }

    /**
     * Starts the service and returns when it has ended and stopped.
     *
     * @param reloadFrom the config file SIGHUP reads again; null: no reload
     * @throws StartFailed the status server cannot listen on its address (unless {@code http = "off"}): nothing
     *                     has started
     */
    public static void serve(Service s, Path reloadFrom, StatusServerStarter statusServer) throws Exception {
        AutoCloseable[] server = new AutoCloseable[1];
        SystemdNotify[] notify = new SystemdNotify[1];
        AtomicBoolean stopping = new AtomicBoolean();
        Runnable stopAll = () -> {
            if (notify[0] != null && stopping.compareAndSet(false, true)) {
                notify[0].send("STOPPING=1");
            }
            s.stop();
            synchronized (server) {
                if (server[0] != null) {
                    try {
                        server[0].close(); // last, so health and metrics answer while the rest shuts down
                    } catch (Exception e) {
                        LOG.warn("status server: {}", e.toString());
                    }
                    server[0] = null;
                }
            }
        };
        if (s.config().http() != null) {
            try {
                synchronized (server) {
                    server[0] = statusServer.start(s.config().http(), s);
                }
            } catch (IOException e) {
                // a site relies on health and metrics: running on without them would hide every later problem
                throw new StartFailed("status server: " + e.getMessage()
                        + " (set [service] http to another address, or to \"off\")", e);
            }
        }
        Thread hook = new Thread(stopAll, "shutdown");
        Runtime.getRuntime().addShutdownHook(hook);
        try {
            s.start();
        } catch (IOException | RuntimeException e) {
            stopAll.run();
            Runtime.getRuntime().removeShutdownHook(hook);
            throw e;
        }
        notify[0] = SystemdNotify.fromEnvironment(s);
        if (reloadFrom != null) {
            // SIGHUP (systemctl reload): read the file again on a thread of its own
            sun.misc.Signal.handle(new sun.misc.Signal("HUP"), sig -> {
                Thread t = new Thread(() -> reload(s, reloadFrom, notify[0]), "reload");
                t.setDaemon(true);
                t.start();
            });
        }
        if (notify[0] != null) {
            notify[0].send("READY=1\nSTATUS=watching " + s.pipelines().size() + " cameras\nMAINPID="
                    + ProcessHandle.current().pid());
        }
        s.awaitEnd();
        stopAll.run();
        if (notify[0] != null) {
            notify[0].close();
        }
        try {
            Runtime.getRuntime().removeShutdownHook(hook);
        } catch (IllegalStateException shuttingDown) {
            // the hook is already running
        }
    }

    private static void reload(Service s, Path file, SystemdNotify notify) {
        if (notify != null) {
            notify.send("RELOADING=1");
        }
        try {
            reload(s, file);
        } finally {
            if (notify != null) {
                notify.send("READY=1\nSTATUS=watching " + s.pipelines().size() + " cameras");
            }
        }
    }

    /** Reads the config again and applies it; a bad file is refused with its mistakes, the running config stays. */
    static void reload(Service s, Path file) {
        LOG.info("reload: reading {}", file);
        SiteConfig next;
        try {
            next = ConfigLoader.load(file);
        } catch (RuntimeException e) {
            LOG.error("reload refused ({}); the running config stays", LogText.clean(e.toString()));
            return;
        } catch (ConfigException e) {
            for (String line : e.shown()) {
                LOG.error("reload: {}", line);
            }
            LOG.error("reload refused ({} {}); the running config stays", e.errors().size(),
                    e.errors().size() == 1 ? "mistake" : "mistakes");
            return;
        }
        s.reload(next);
    }
}
