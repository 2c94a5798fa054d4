// Database tests connect with the passwords generated into .env.local.
import "@/lib/local-env";
