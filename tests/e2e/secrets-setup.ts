// vitest setup file: test files sign tokens and log in to the broker with the stack's secrets.
import { inject } from "vitest";

Object.assign(process.env, inject("secrets"));
