import { handlers } from "@/app/_server/auth";

export const { GET, POST } = handlers;
