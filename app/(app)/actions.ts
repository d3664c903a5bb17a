"use server";
import { signOut } from "@/app/_server/auth";

export async function signOutAction() {
  await signOut({ redirectTo: "/sign-in" });
}
